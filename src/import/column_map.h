// SPDX-License-Identifier: Apache-2.0
// Column mappings of instrument exports: `position=Seq,sample=Sample Name,response=Area` names,
// for each logical column of a run or points file, the header the instrument writes instead.
#pragma once

#include <set>
#include <string>
#include <string_view>

#include "domain/run.h"

namespace cw::import {

/// Parses `NAME=HEADER[,NAME=HEADER...]`. Names are logical columns among `names` (compared in
/// lower case); headers are visible one-line text of at most 100 characters without ',' (they
/// are matched case-insensitively). Throws ValidationError starting with `what` (an option) for
/// an empty mapping or entry, a pair without '=', an unknown name, a name or a header given
/// twice.
ColumnMapping parse_column_mapping(std::string_view text, const std::set<std::string>& names,
                                   std::string_view what);

/// The logical columns of run files and of points files together (a saved instrument mapping
/// may name either).
std::set<std::string> all_mappable_columns();

}  // namespace cw::import
