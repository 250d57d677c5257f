// SPDX-License-Identifier: Apache-2.0
// Listings as CSV (RFC 4180): the rows of a listing's JSON document, one header row, the columns
// each listing declares here. The cells are the JSON values: times in UTC ISO-8601, numbers in
// their shortest round-trip form (full precision), lists of words joined with ';', anything
// nested deeper as compact JSON. The JSON document is the one source; CSV never computes.
#pragma once

#include <ostream>
#include <string>
#include <string_view>
#include <vector>

#include "report/json.h"

namespace cw::report {

struct CsvListing {
  std::string_view command;               ///< "curve list"
  std::string_view rows;                  ///< the array of rows in the JSON document: "curves"
  std::vector<std::string_view> columns;  ///< paths into a row; "range.low" reads a nested field
};

/// Every listing that offers --csv.
const std::vector<CsvListing>& csv_listings();
/// The listing of `command`, or nullptr.
const CsvListing* csv_listing(std::string_view command);

/// The text of one cell: "" for null or a missing field, true/false, shortest numbers, strings
/// as they are, a list of strings or numbers joined with ';', other lists and objects as compact
/// JSON.
std::string csv_cell(const Json& value);
/// `text` quoted as RFC 4180 asks when it holds a comma, a double quote, a line break or leading
/// or trailing white space; a text that a spreadsheet would run as a formula (starting with =,
/// +, -, @) is prefixed with an apostrophe and quoted (OWASP CSV injection guidance), unless it is
/// a number.
std::string csv_quote(std::string_view text, bool is_number = false);
/// Writes a listing row by row (long listings are never held whole): the header, then one line
/// per JSON row, each ended with CRLF.
class CsvWriter {
 public:
  CsvWriter(std::ostream& out, const CsvListing& listing) : out_(out), listing_(listing) {}
  void header();
  void row(const Json& row);

 private:
  std::ostream& out_;
  const CsvListing& listing_;
};

/// The header and one line per row of `document[listing.rows]`.
void write_csv(std::ostream& out, const Json& document, const CsvListing& listing);

}  // namespace cw::report
