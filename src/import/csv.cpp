// SPDX-License-Identifier: Apache-2.0
// CSV reading.
#include "import/csv.h"

#include <algorithm>

#include "core/error.h"
#include "core/text.h"
#include "core/utf8.h"

namespace cw::import {
namespace {

constexpr std::string_view kByteOrderMark = "\xEF\xBB\xBF";

}  // namespace

void CsvSplitter::feed(std::string_view chunk, std::vector<CsvRecord>& out) {
  if (!started_) {
    // Decide about the byte-order mark once the first three bytes are known.
    const std::size_t n = std::min(3 - start_.size(), chunk.size());
    start_.append(chunk.substr(0, n));
    chunk.remove_prefix(n);
    if (start_.size() < 3) return;
    started_ = true;
    const std::string head = std::move(start_);
    start_.clear();
    if (head != kByteOrderMark) {
      for (char c : head) take(c, out);
    }
  }
  for (char c : chunk) take(c, out);
}

void CsvSplitter::finish(std::vector<CsvRecord>& out) {
  if (!started_) {
    started_ = true;
    const std::string head = std::move(start_);
    for (char c : head) take(c, out);
  }
  if (quote_pending_) {
    quote_pending_ = false;
    quoted_ = false;
  }
  if (quoted_) {
    throw ValidationError(
        SourceLocation{file_, record_.line, std::nullopt, {}},
        "a quoted field starting on this line is never closed",
        "close the field with a double quote (\"\"), or double any quote inside it");
  }
  end_record(out);
}

void CsvSplitter::end_field() {
  record_.fields.push_back(was_quoted_ ? field_ : trim(field_));
  field_.clear();
  was_quoted_ = false;
}

void CsvSplitter::end_record(std::vector<CsvRecord>& out) {
  end_field();
  const bool blank = record_.fields.size() == 1 && record_.fields[0].empty();
  if (!blank) {
    for (std::size_t i = 0; i < record_.fields.size(); ++i) {
      if (!is_valid_utf8(record_.fields[i])) {
        throw ValidationError(SourceLocation{file_, record_.line, static_cast<long>(i + 1), {}},
                              "'" + file_ + "' is not UTF-8 text",
                              "save the file as UTF-8 (plain CSV text)");
      }
    }
    out.push_back(std::move(record_));
  }
  record_ = CsvRecord{line_, {}};
}

void CsvSplitter::take(char c, std::vector<CsvRecord>& out) {
  if (after_cr_) {
    after_cr_ = false;
    if (c == '\n') return;  // CR LF is one line end
  }
  if (quote_pending_) {
    quote_pending_ = false;
    if (c == '"') {  // a doubled quote inside a quoted field
      field_ += '"';
      return;
    }
    quoted_ = false;  // the quote closed the field; `c` is read outside quotes
  }
  if (quoted_) {
    if (c == '"') {
      quote_pending_ = true;
      return;
    }
    if (c == '\n') ++line_;
    field_ += c;
    return;
  }
  if (c == '"' && trim(field_).empty()) {
    quoted_ = true;
    was_quoted_ = true;
    field_.clear();
  } else if (c == ',') {
    end_field();
  } else if (c == '\r' || c == '\n') {
    ++line_;
    after_cr_ = c == '\r';
    end_record(out);
  } else {
    field_ += c;
  }
}

CsvHeader CsvHeader::read(const std::string& file, const CsvRecord& header,
                          const std::set<std::string>& required,
                          const std::set<std::string>& optional, const HeaderMapping* mapping) {
  CsvHeader h;
  h.width_ = header.fields.size();
  h.line_ = header.line;
  std::string allowed;
  for (const auto& r : required) allowed += (allowed.empty() ? "" : ", ") + r;
  for (const auto& o : optional) allowed += ", " + o;
  const auto known = [&](const std::string& name) {
    return required.count(name) > 0 || optional.count(name) > 0;
  };
  // The mapping's entries for this kind of file, by lower-case header.
  std::map<std::string, std::string> by_header;
  if (mapping != nullptr) {
    for (const auto& [name, text] : mapping->entries) {
      if (known(name)) by_header[to_lower(trim(text))] = name;
    }
  }
  std::map<std::string, std::string> mapped_from;  // name -> header, for names found mapped
  for (std::size_t i = 0; i < header.fields.size(); ++i) {
    const std::string& raw = header.fields[i];
    const std::string lower = to_lower(raw);
    const SourceLocation where{file, header.line, static_cast<long>(i + 1), raw};
    if (lower.empty()) {
      throw ValidationError(where, "column " + std::to_string(i + 1) + " has no header",
                            "columns: " + allowed);
    }
    std::string name;
    if (auto m = by_header.find(lower); m != by_header.end()) {
      name = m->second;
      mapped_from[name] = raw;
    } else if (known(lower)) {
      name = lower;
    } else if (mapping != nullptr) {
      h.ignored_.push_back(raw);
      continue;
    } else if (raw.find('\t') != std::string::npos || raw.find(';') != std::string::npos) {
      // One field holding the whole header: another separator than the comma.
      throw ValidationError(
          where, "unknown column " + quote(raw),
          std::string("the fields look separated by ") +
              (raw.find('\t') != std::string::npos ? "tabs" : "semicolons") +
              ": save the file as CSV with commas between fields (columns: " + allowed + ")");
    } else {
      throw ValidationError(where, "unknown column " + quote(raw),
                            "columns: " + allowed +
                                " (an instrument export's own headers can be mapped with "
                                "--columns NAME=HEADER,...)");
    }
    if (auto seen = h.columns_.find(name); seen != h.columns_.end()) {
      std::string message = "column " + quote(name) + " appears twice in the header";
      if (mapping != nullptr && mapped_from.count(name)) {
        message += " (as " + quote(h.headers_.at(name)) + " and as " + quote(raw) + ", which " +
                   mapping->source + " maps to it)";
      }
      throw ValidationError(where, message);
    }
    h.columns_.emplace(name, i);
    h.headers_.emplace(name, raw);
  }
  if (mapping != nullptr) {
    for (const auto& [name, text] : mapping->entries) {
      if (!known(name) || h.columns_.count(name)) continue;
      std::string present;
      for (const auto& f : header.fields) present += (present.empty() ? "" : ", ") + quote(f);
      throw ValidationError(
          SourceLocation{file, header.line, std::nullopt, text},
          "no column " + quote(text) + " (" + mapping->source + " maps it to " + quote(name) + ")",
          "the header has " + present + "; correct the mapping or the file");
    }
  }
  for (const auto& r : required) {
    if (!h.columns_.count(r)) {
      throw ValidationError(
          SourceLocation{file, header.line, std::nullopt, r}, "missing column " + quote(r),
          "the header must name the columns " + allowed +
              " (optional ones may be left out); an instrument export's own headers can be "
              "mapped with --columns NAME=HEADER,...");
    }
  }
  return h;
}

std::string CsvHeader::label(const std::string& name) const {
  const auto found = headers_.find(name);
  if (found == headers_.end() || to_lower(found->second) == name) return "'" + name + "'";
  return quote(found->second) + " (" + name + ")";
}

const std::string& CsvHeader::field_name(const std::string& name) const {
  const auto found = headers_.find(name);
  return found != headers_.end() ? found->second : name;
}

const std::string& CsvHeader::field(const CsvRecord& record, const std::string& name) const {
  auto it = columns_.find(name);
  if (it == columns_.end()) return empty_;
  return record.fields[it->second];
}

void require_width(const std::string& file, const CsvHeader& header, const CsvRecord& record) {
  if (record.fields.size() != header.width()) {
    throw ValidationError(
        SourceLocation{file, record.line, std::nullopt, {}},
        "has " + std::to_string(record.fields.size()) + " fields, the header has " +
            std::to_string(header.width()),
        "every line needs one value per header column (empty values are allowed: ,,)");
  }
}

CsvTable CsvTable::parse(const std::string& file, const std::string& text,
                         const std::set<std::string>& required,
                         const std::set<std::string>& optional, const HeaderMapping* mapping) {
  CsvTable t;
  t.file_ = file;
  std::vector<CsvRecord> records;
  CsvSplitter splitter(file);
  splitter.feed(text, records);
  splitter.finish(records);
  if (records.empty()) {
    throw ValidationError(SourceLocation{file, 1, std::nullopt, {}}, "'" + file + "' is empty",
                          "the first line must be a header naming the columns");
  }
  t.header_ = CsvHeader::read(file, records.front(), required, optional, mapping);
  for (std::size_t k = 1; k < records.size(); ++k) {
    require_width(file, t.header_, records[k]);
    t.records_.push_back(std::move(records[k]));
  }
  if (t.records_.empty()) {
    throw ValidationError(SourceLocation{file, records.front().line + 1, std::nullopt, {}},
                          "'" + file + "' has a header but no data lines",
                          "add one line per calibrator after the header");
  }
  return t;
}

}  // namespace cw::import
