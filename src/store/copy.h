// SPDX-License-Identifier: Apache-2.0
// Copying a whole store (`store copy`), backend-neutral: every row of the audit trail and of
// every fact table, read in id order in the terms of row_form.h (one CellValue per column) and
// appended verbatim to an empty store (the same ids, the same audit_seq, the same payloads and
// hashes), so that the copy's trail verifies with the source's head hash. A backend offers the
// reading side on its units (ReadUnit::table_rows) and the writing side on its store
// (Store::load).
#pragma once

#include <cstdint>
#include <functional>
#include <span>
#include <string_view>
#include <vector>

#include "store/row_form.h"

namespace cw::store {

/// A table a copy carries, with its columns in the table's order.
struct CopyTable {
  std::string_view name;
  std::span<const Column> columns;  ///< the first column is the row's id (audit_log: seq)
};

/// Every table of a store in the order a copy appends them: audit_log, then the fact tables in
/// kAllFactTables order (a table comes after every table it references). The audit trail's
/// payload is Text, not Json: its bytes are what the entry's hash covers and are copied as they
/// are.
std::span<const CopyTable> copy_tables();

/// One row: the values of a CopyTable's columns, in order.
using CopyRow = std::vector<CellValue>;

/// The reading side: every row of a table, from the unit's snapshot.
class TableRowReader {
 public:
  virtual ~TableRowReader() = default;
  /// Calls `row` for every row of `table` in the order of its first column. Throws StoreError
  /// (exit 4) when a value cannot be read as a CellValue.
  virtual void each_row(const CopyTable& table, const std::function<void(const CopyRow&)>& row) = 0;
};

/// The writing side: one write transaction on a store that holds no rows yet. Destroyed without
/// commit(), everything is rolled back.
class StoreLoader {
 public:
  virtual ~StoreLoader() = default;
  /// True when the audit trail and every fact table are empty (read inside the transaction).
  virtual bool empty() = 0;
  /// Appends `row` to `table` as it is (ids included). Ids numbered by the store afterwards
  /// continue after the copied ones.
  virtual void append_row(const CopyTable& table, const CopyRow& row) = 0;
  /// Commits every appended row at once.
  virtual void commit() = 0;
};

}  // namespace cw::store
