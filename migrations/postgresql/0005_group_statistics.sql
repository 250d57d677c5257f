-- SPDX-License-Identifier: Apache-2.0
-- What the planner knows of a (method, instrument, analyte) group. Without it PostgreSQL
-- multiplies the three columns' selectivities, expects one curve per group, and reads a group's
-- live or latest curves through curves_by_instrument_group, every curve the group ever had,
-- where curves_by_group seeks them by acquisition time: at 100 000 curves 41 buffers a look-up
-- instead of 5, and ten times that at a million (SQLite's statements name the index instead).
-- The columns' dependencies and distinct groups let it count a group's curves right.
CREATE STATISTICS curves_group_statistics (ndistinct, dependencies)
  ON method_id, instrument_id, analyte FROM curves;
ANALYZE curves;
