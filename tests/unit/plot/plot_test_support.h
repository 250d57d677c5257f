// SPDX-License-Identifier: Apache-2.0
// Helpers of the plot tests: where files go, reading them back, a small XML well-formedness
// check, PNG header fields, marker counts in SVG and the command-line tools of poppler and
// librsvg.
#pragma once

#include <cairo.h>

#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

namespace plot_test {

/// A file name in the tests' output folder (created on first use). The files of the last run
/// stay there so that they can be looked at.
inline std::string out_path(const std::string& name) {
  const std::filesystem::path dir = CW_PLOT_TEST_OUT_DIR;
  std::filesystem::create_directories(dir);
  return (dir / name).string();
}

inline std::string read_bytes(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

/// Width and height from a PNG's IHDR chunk (bytes 16-23, big-endian), after checking the
/// 8-byte signature and that IHDR is the first chunk (PNG specification §5.2, §11.2.2).
struct PngSize {
  std::uint32_t width = 0;
  std::uint32_t height = 0;
};
inline std::optional<PngSize> png_size(const std::string& bytes) {
  static const std::string kSignature("\x89PNG\r\n\x1a\n", 8);
  if (bytes.size() < 24 || bytes.compare(0, 8, kSignature) != 0) return std::nullopt;
  if (bytes.compare(12, 4, "IHDR") != 0) return std::nullopt;
  const auto be32 = [&](std::size_t at) {
    std::uint32_t v = 0;
    for (std::size_t i = 0; i < 4; ++i) v = (v << 8) | static_cast<unsigned char>(bytes[at + i]);
    return v;
  };
  return PngSize{be32(16), be32(20)};
}

/// True when every pixel within `border` pixels of the edge of the PNG at `path` is white:
/// nothing drawn runs off (or up to) the page edge. cairo reads the file back.
inline bool png_border_is_white(const std::string& path, int border) {
  cairo_surface_t* image = cairo_image_surface_create_from_png(path.c_str());
  bool white = cairo_surface_status(image) == CAIRO_STATUS_SUCCESS;
  if (white) {
    cairo_surface_flush(image);
    const int w = cairo_image_surface_get_width(image);
    const int h = cairo_image_surface_get_height(image);
    const int stride = cairo_image_surface_get_stride(image);
    const unsigned char* data = cairo_image_surface_get_data(image);
    for (int y = 0; y < h && white; ++y) {
      const auto* row = reinterpret_cast<const std::uint32_t*>(data + y * stride);
      for (int x = 0; x < w; ++x) {
        const bool edge = x < border || y < border || x >= w - border || y >= h - border;
        if (edge && (row[x] & 0xFFFFFFu) != 0xFFFFFFu) {
          white = false;
          break;
        }
      }
    }
  }
  cairo_surface_destroy(image);
  return white;
}

/// Structural XML check: every element closed in order, one root element named `root`,
/// quoted attribute values, comments, processing instructions and CDATA skipped. Returns an
/// empty string when well formed, else what is wrong.
inline std::string xml_problem(const std::string& text, const std::string& root) {
  std::vector<std::string> open;
  int roots = 0;
  std::size_t i = 0;
  while ((i = text.find('<', i)) != std::string::npos) {
    if (text.compare(i, 4, "<!--") == 0) {
      const auto end = text.find("-->", i);
      if (end == std::string::npos) return "unclosed comment";
      i = end + 3;
      continue;
    }
    if (text.compare(i, 9, "<![CDATA[") == 0) {
      const auto end = text.find("]]>", i);
      if (end == std::string::npos) return "unclosed CDATA";
      i = end + 3;
      continue;
    }
    if (text.compare(i, 2, "<?") == 0 || text.compare(i, 2, "<!") == 0) {
      const auto end = text.find('>', i);
      if (end == std::string::npos) return "unclosed declaration";
      i = end + 1;
      continue;
    }
    // Find the end of the tag, skipping '>' inside quoted attribute values.
    std::size_t j = i + 1;
    char quote = 0;
    for (; j < text.size(); ++j) {
      if (quote != 0) {
        if (text[j] == quote) quote = 0;
      } else if (text[j] == '"' || text[j] == '\'') {
        quote = text[j];
      } else if (text[j] == '>') {
        break;
      }
    }
    if (j >= text.size()) return "unclosed tag at byte " + std::to_string(i);
    const std::string tag = text.substr(i + 1, j - i - 1);
    const bool closing = !tag.empty() && tag.front() == '/';
    const bool self_closing = !tag.empty() && tag.back() == '/';
    std::string name = tag.substr(closing ? 1 : 0);
    name = name.substr(0, name.find_first_of(" \t\r\n/"));
    if (name.empty()) return "tag without a name at byte " + std::to_string(i);
    if (closing) {
      if (open.empty() || open.back() != name) return "unexpected </" + name + ">";
      open.pop_back();
    } else {
      if (open.empty()) {
        ++roots;
        if (name != root) return "root element is <" + name + ">";
      }
      if (!self_closing) open.push_back(name);
    }
    i = j + 1;
  }
  if (!open.empty()) return "<" + open.back() + "> not closed";
  if (roots != 1) return std::to_string(roots) + " root elements";
  return {};
}

/// Data markers in a cairo SVG: one <path> each, marked by their miter limit (plot.h).
inline int count_svg_markers(const std::string& svg) {
  int n = 0;
  for (std::size_t at = 0; (at = svg.find("stroke-miterlimit:7;", at)) != std::string::npos; ++at) {
    ++n;
  }
  return n;
}

/// Runs a shell command; its standard output, or nullopt when it fails.
inline std::optional<std::string> run(const std::string& command) {
  FILE* pipe = popen((command + " 2>/dev/null").c_str(), "r");
  if (pipe == nullptr) return std::nullopt;
  std::string out;
  char buffer[4096];
  std::size_t got = 0;
  while ((got = std::fread(buffer, 1, sizeof buffer, pipe)) > 0) out.append(buffer, got);
  if (pclose(pipe) != 0) return std::nullopt;
  return out;
}

inline bool have_tool(const std::string& name) {
  return run("command -v " + name).has_value();
}

/// A field of poppler's `pdfinfo -isodates` report ("Pages", "CreationDate", ...), without
/// the padding; empty when pdfinfo fails or has no such field.
inline std::string pdf_info(const std::string& path, const std::string& field) {
  const auto info = run("pdfinfo -isodates '" + path + "'");
  if (!info) return {};
  std::istringstream lines(*info);
  std::string line;
  while (std::getline(lines, line)) {
    if (line.rfind(field + ":", 0) != 0) continue;
    const auto value = line.find_first_not_of(' ', field.size() + 1);
    return value == std::string::npos ? std::string() : line.substr(value);
  }
  return {};
}

/// The text of a PDF as poppler's `pdftotext -layout` extracts it: of page `page` (1-based) only,
/// or of every page when `page` is 0 (pages separated by form feeds). Empty when it fails.
inline std::string pdf_text(const std::string& path, int page = 0) {
  std::string range;
  if (page > 0) range = " -f " + std::to_string(page) + " -l " + std::to_string(page);
  return run("pdftotext -layout -enc UTF-8" + range + " '" + path + "' -").value_or("");
}

}  // namespace plot_test
