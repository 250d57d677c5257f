// SPDX-License-Identifier: Apache-2.0
// Opening and reading input files (method, points, run files) safely: only regular files, a
// size cap enforced while reading, errors that name the option and the file.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace cw::import {

/// Size caps of the input files (documented in the README).
inline constexpr std::size_t kMaxMethodFileBytes = 1u << 20;   ///< 1 MiB
inline constexpr std::size_t kMaxPointsFileBytes = 16u << 20;  ///< 16 MiB

/// An open regular file. The path is checked with stat() before it is opened (so a FIFO or a
/// device is refused without blocking), opened non-blocking, and checked again with fstat() on
/// the open descriptor (so a file swapped in between is refused too). The path "-" reads
/// standard input (a pipe or a redirected file, not a terminal), with the same cap; it may be
/// opened again in the same process and read from its start (run import reads its file twice):
/// a pipe is copied whole into an unnamed temporary file the first time.
class InputFile {
 public:
  /// Opens `path` for reading at most `max_bytes`. `option` names where the path came from
  /// ("--points", "FILE"), for messages. Throws ValidationError (file named) when the path does
  /// not exist, is not a regular file, cannot be read, or is already larger than the cap.
  InputFile(const std::string& path, std::size_t max_bytes, std::string_view option);
  InputFile(const InputFile&) = delete;
  InputFile& operator=(const InputFile&) = delete;
  ~InputFile();

  const std::string& path() const { return path_; }

  /// Appends up to `chunk` bytes to `out`; false at the end of the file. Throws ValidationError
  /// as soon as more than the cap has been read (the file grew, or lied about its size).
  bool read_some(std::string& out, std::size_t chunk = 1u << 16);
  /// The rest of the file.
  std::string read_all();

 private:
  std::string path_;
  std::string option_;
  std::size_t max_bytes_;
  std::size_t read_ = 0;
  int fd_ = -1;
};

/// The name a file read from `path` is recorded under: the path, or "(standard input)" for "-".
std::string recorded_name(const std::string& path);

/// The whole file as text: InputFile::read_all(), then checked to be well-formed UTF-8.
std::string read_text_file(const std::string& path, std::size_t max_bytes, std::string_view option);

}  // namespace cw::import
