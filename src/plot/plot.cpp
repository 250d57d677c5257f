// SPDX-License-Identifier: Apache-2.0
// output_format_for(): the file extension decides the format.
#include "plot/plot.h"

#include <cctype>
#include <string>

#include "core/error.h"

namespace cw::plot {

OutputFormat output_format_for(const std::string& path) {
  const auto dot = path.find_last_of('.');
  const auto slash = path.find_last_of('/');
  std::string extension;
  if (dot != std::string::npos && (slash == std::string::npos || dot > slash)) {
    extension = path.substr(dot + 1);
    for (char& c : extension) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  }
  if (extension == "svg") return OutputFormat::Svg;
  if (extension == "png") return OutputFormat::Png;
  if (extension == "pdf") return OutputFormat::Pdf;
  throw ValidationError(
      SourceLocation{path, std::nullopt, std::nullopt, {}},
      "cannot write plot '" + path + "': unknown file extension (expected .svg, .png or .pdf)");
}

}  // namespace cw::plot
