// SPDX-License-Identifier: Apache-2.0
// Ed25519 lab keys with libsodium, and their key file.
#include "crypto/lab_key.h"

#include <fcntl.h>
#include <sodium.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <vector>

namespace cw::crypto {
namespace {

constexpr const char* kHeader = "curvewarden lab key 1";

void ready() {
  if (sodium_init() < 0) throw std::runtime_error("libsodium could not be initialised");
}

std::string to_hex(const unsigned char* data, std::size_t size) {
  std::string out(size * 2 + 1, '\0');
  sodium_bin2hex(out.data(), out.size(), data, size);
  out.pop_back();
  return out;
}

/// The bytes of `hex`, which must be exactly `size` bytes long; nullopt-like empty on error.
std::vector<unsigned char> from_hex(const std::string& hex, std::size_t size) {
  std::vector<unsigned char> out(size);
  std::size_t length = 0;
  const char* end = nullptr;
  if (hex.size() != size * 2 ||
      sodium_hex2bin(out.data(), out.size(), hex.data(), hex.size(), nullptr, &length, &end) != 0 ||
      length != size) {
    return {};
  }
  return out;
}

}  // namespace

LabKey generate_lab_key() {
  ready();
  unsigned char pk[crypto_sign_PUBLICKEYBYTES];
  unsigned char sk[crypto_sign_SECRETKEYBYTES];
  crypto_sign_keypair(pk, sk);
  LabKey key{to_hex(pk, sizeof pk), to_hex(sk, sizeof sk)};
  sodium_memzero(sk, sizeof sk);
  return key;
}

void write_lab_key(const std::string& path, const LabKey& key) {
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC, 0600);
  if (fd < 0) {
    throw std::runtime_error("cannot create the lab key file '" + path +
                             "': " + std::strerror(errno));
  }
  const std::string text =
      std::string(kHeader) + "\npublic " + key.public_hex + "\nsecret " + key.secret_hex + "\n";
  std::size_t done = 0;
  while (done < text.size()) {
    const ssize_t n = ::write(fd, text.data() + done, text.size() - done);
    if (n < 0) {
      if (errno == EINTR) continue;
      const std::string why = std::strerror(errno);
      ::close(fd);
      throw std::runtime_error("cannot write the lab key file '" + path + "': " + why);
    }
    done += static_cast<std::size_t>(n);
  }
  if (::fsync(fd) != 0 || ::close(fd) != 0) {
    throw std::runtime_error("cannot write the lab key file '" + path + "'");
  }
}

LabKey read_lab_key(const std::string& path) {
  struct stat st {};
  if (::stat(path.c_str(), &st) != 0) {
    throw std::runtime_error("no lab key file at '" + path + "'");
  }
  if ((st.st_mode & 077) != 0) {
    throw std::runtime_error("the lab key file '" + path +
                             "' can be read by others than its owner (chmod 600 it)");
  }
  std::ifstream in(path);
  std::string header, pub_word, pub, sec_word, sec;
  std::getline(in, header);
  in >> pub_word >> pub >> sec_word >> sec;
  if (header != kHeader || pub_word != "public" || sec_word != "secret" ||
      from_hex(pub, crypto_sign_PUBLICKEYBYTES).empty() ||
      from_hex(sec, crypto_sign_SECRETKEYBYTES).empty()) {
    throw std::runtime_error("'" + path + "' is not a curvewarden lab key file (or is damaged)");
  }
  return {pub, sec};
}

std::string sign(const LabKey& key, std::string_view message) {
  ready();
  std::vector<unsigned char> sk = from_hex(key.secret_hex, crypto_sign_SECRETKEYBYTES);
  if (sk.empty()) throw std::runtime_error("damaged lab key");
  unsigned char sig[crypto_sign_BYTES];
  crypto_sign_detached(sig, nullptr, reinterpret_cast<const unsigned char*>(message.data()),
                       message.size(), sk.data());
  sodium_memzero(sk.data(), sk.size());
  return to_hex(sig, sizeof sig);
}

bool signature_valid(const std::string& public_hex, std::string_view message,
                     const std::string& signature_hex) {
  ready();
  const auto pk = from_hex(public_hex, crypto_sign_PUBLICKEYBYTES);
  const auto sig = from_hex(signature_hex, crypto_sign_BYTES);
  if (pk.empty() || sig.empty()) return false;
  return crypto_sign_verify_detached(sig.data(),
                                     reinterpret_cast<const unsigned char*>(message.data()),
                                     message.size(), pk.data()) == 0;
}

std::string key_fingerprint(const std::string& public_hex) {
  ready();
  unsigned char digest[crypto_hash_sha256_BYTES];
  crypto_hash_sha256(digest, reinterpret_cast<const unsigned char*>(public_hex.data()),
                     public_hex.size());
  return to_hex(digest, sizeof digest);
}

}  // namespace cw::crypto
