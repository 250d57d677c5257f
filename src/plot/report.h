// SPDX-License-Identifier: Apache-2.0
// What the printable reports share: the frame of every report (laboratory, generation time,
// cautions), signature manifestations and the audit entries behind the records shown.
//
// The reports are laid out by document.h. Their inputs are plain text the caller has already
// formatted (numbers with their decimals and units, instants in the lab's zone): the layout
// never rounds, converts or decides anything.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "core/time.h"

namespace cw::plot {

/// The standing caution of every report (product.md §8), shown in full in its own section.
inline constexpr const char* kReportCaution =
    "Curvewarden records calibration data and applies the rules your laboratory has configured. "
    "It supports your quality system and never replaces it: your SOPs and method validation, your "
    "accreditation body and the regulations that apply to you decide acceptance criteria, "
    "intervals and reporting. A qualified, authorised person reviews every result before it is "
    "released.";

/// The one-line form of the caution, repeated in the footer of every page.
inline constexpr const char* kReportCautionLine =
    "Supports and never replaces the laboratory's quality system: a qualified person reviews "
    "results before release.";

/// What every report carries besides its subject.
struct ReportFrame {
  std::string lab;  ///< laboratory name: running head and the PDF's author
  /// When the report was generated, as lab-local display text ("2024-03-05 14:30 +01:00"),
  /// printed in every footer.
  std::string generated_at;
  /// The same moment as an instant: written as the PDF's creation date, so that the same input
  /// gives the same bytes (CURVEWARDEN_NOW in tests and the demo).
  Instant created_at{};
  std::string generated_by;  ///< who ran the command; may be empty
  std::string tool_version;  ///< e.g. "curvewarden 0.9.0"; may be empty
  std::string caution = kReportCaution;
  std::string caution_line = kReportCautionLine;
};

/// The manifestation of an electronic signature: who signed, when and what the signature means.
struct SignatureManifestation {
  std::string full_name;  ///< e.g. "Jane Doe"
  std::string signed_at;  ///< lab-local display text
  std::string meaning;    ///< e.g. "review and approval"
};

/// A person's part in the record: "jdoe (Jane Doe)", "2024-03-01 09:12 +01:00", "logged the
/// calibration", with the signature's manifestation once signatures exist.
struct PersonLine {
  std::string name;
  std::string at;
  std::string action;
  std::optional<SignatureManifestation> signature;
};

/// One audit entry whose payload holds a record shown in the report.
struct AuditEntryRef {
  std::int64_t seq = 0;
  std::string recorded_at;  ///< lab-local display text
  std::string actor;
  std::string action;  ///< e.g. "curve.log", "curve.review"
  std::string entity;  ///< e.g. "curve 17"; may be empty
};

/// The audit entries behind the records shown and the head of the trail when the report was
/// made, so that a reader can check the printed records against the store (`audit verify`).
struct AuditReference {
  std::vector<AuditEntryRef> entries;
  std::int64_t head_seq = 0;  ///< the newest entry of the trail
  std::string head_hash;      ///< its hash: lowercase hex SHA-256
  std::string verification;   ///< e.g. "chain verified: 57 entries, intact"; may be empty
};

}  // namespace cw::plot
