// SPDX-License-Identifier: Apache-2.0
// Internal to plot/: the sections the curve and run reports share, built as document blocks.
#pragma once

#include <string>

#include "plot/document.h"
#include "plot/report.h"

namespace cw::plot::detail {

/// A document with the report's frame: title, running head, footer and PDF metadata.
Document report_document(const ReportFrame& frame, const std::string& title,
                         const std::string& subtitle, const std::string& running_head);

/// "Code version N — title" with the parts that are present.
std::string method_text(const std::string& code, const std::string& version,
                        const std::string& title);
/// "CODE (name)" or "CODE".
std::string instrument_text(const std::string& code, const std::string& name);
/// "name · action · at" with the parts that are present.
std::string person_text(const PersonLine& person);

/// The audit entries table and the head of the trail.
void add_audit_section(Document& d, const std::string& heading, const AuditReference& audit);
/// The standing caution as a framed notice.
void add_caution_section(Document& d, const std::string& heading, const ReportFrame& frame);

/// A signature field for `role`: the person's printed lines and their signature's
/// manifestation, or blank lines to sign by hand (also when `person` is null).
SignatureFields::Field signature_field(const std::string& role, const PersonLine* person,
                                       const std::string& meaning_by_hand);

}  // namespace cw::plot::detail
