// SPDX-License-Identifier: Apache-2.0
// The frame, audit, caution and signature parts of the printable reports.
#include "plot/report_parts.h"

#include <string>
#include <vector>

namespace cw::plot::detail {

Document report_document(const ReportFrame& frame, const std::string& title,
                         const std::string& subtitle, const std::string& running_head) {
  Document d;
  d.title = title;
  d.subtitle = subtitle;
  d.running_head_left = frame.lab;
  d.running_head_right = running_head;
  std::string generated = "Generated " + frame.generated_at;
  if (!frame.generated_by.empty()) generated += " by " + frame.generated_by;
  if (!frame.tool_version.empty()) generated += " \u00b7 " + frame.tool_version;
  d.generated_text = generated;
  d.footer_caution = frame.caution_line;
  d.created_at = frame.created_at;
  d.author = frame.lab;
  return d;
}

std::string method_text(const std::string& code, const std::string& version,
                        const std::string& title) {
  std::string text = code;
  if (!version.empty()) text += " version " + version;
  if (!title.empty()) text += " \u2014 " + title;
  return text;
}

std::string instrument_text(const std::string& code, const std::string& name) {
  return name.empty() ? code : code + " (" + name + ")";
}

std::string person_text(const PersonLine& person) {
  std::string text = person.name;
  for (const std::string* part : {&person.action, &person.at}) {
    if (part->empty()) continue;
    text += (text.empty() ? "" : " \u00b7 ") + *part;
  }
  return text;
}

void add_audit_section(Document& d, const std::string& heading, const AuditReference& audit) {
  d.blocks.push_back(Heading{heading});
  d.blocks.push_back(Paragraph{
      "The records shown in this report are held in the payloads of these audit entries. The "
      "head of the trail identifies the whole chain as it stood when the report was made; "
      "\u201ccurvewarden audit verify\u201d recomputes it.",
      Paragraph::Style::Note});
  Table t;
  t.columns = {{"Entry", true}, {"Recorded at"}, {"By"}, {"Action"}, {"Record", false, true}};
  for (const AuditEntryRef& e : audit.entries) {
    t.rows.push_back({{std::to_string(e.seq), e.recorded_at, e.actor, e.action, e.entity}});
  }
  t.empty_text = "no audit entries given";
  d.blocks.push_back(t);
  KeyValueList head;
  head.entries.push_back({"Head of the trail", "entry " + std::to_string(audit.head_seq)});
  head.entries.push_back({"Head hash (SHA-256)", audit.head_hash, true});
  if (!audit.verification.empty()) head.entries.push_back({"Verification", audit.verification});
  d.blocks.push_back(head);
}

void add_caution_section(Document& d, const std::string& heading, const ReportFrame& frame) {
  d.blocks.push_back(Heading{heading});
  d.blocks.push_back(Paragraph{frame.caution, Paragraph::Style::Notice});
}

SignatureFields::Field signature_field(const std::string& role, const PersonLine* person,
                                       const std::string& meaning_by_hand) {
  SignatureFields::Field field;
  field.role = role;
  if (person != nullptr) {
    field.lines.push_back(person->name);
    if (!person->action.empty()) field.lines.push_back(person->action);
    if (person->signature) {
      const SignatureManifestation& s = *person->signature;
      field.signed_lines = {"Signed electronically by " + s.full_name, s.signed_at,
                            "Meaning: " + s.meaning};
      return field;
    }
  } else {
    field.lines.push_back("not in the record yet");
    field.name_line = true;
  }
  field.lines.push_back(meaning_by_hand);
  return field;
}

}  // namespace cw::plot::detail
