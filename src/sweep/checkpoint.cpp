#include "sweep/checkpoint.hpp"

#include <fmt/format.h>

#include <bit>
#include <cstring>
#include <fstream>
#include <iterator>
#include <sstream>

#include "core/error.hpp"
#include "core/io.hpp"

namespace overshoot {

static_assert(std::endian::native == std::endian::little, "checkpoints are written little-endian");

std::uint64_t fingerprint_bytes(std::uint64_t h, const void* data, std::size_t size) {
    const unsigned char* p = static_cast<const unsigned char*>(data);
    for (std::size_t i = 0; i < size; ++i) {
        h ^= p[i];
        h *= 1099511628211ULL;
    }
    return h;
}

std::uint64_t fingerprint_text(std::uint64_t h, const std::string& s) {
    h = fingerprint_bytes(h, s.data(), s.size());
    return fingerprint_bytes(h, "\0", 1);
}

namespace {
template <class T>
void put(std::string& out, const T& v) {
    out.append(reinterpret_cast<const char*>(&v), sizeof v);
}
}  // namespace

void save_checkpoint(const std::string& path, const Checkpoint& c) {
    std::string out = fmt::format("overshoot hunt checkpoint 1\nfingerprint {:016x}\nlengths {}\nrecords {}\n",
                                  c.fingerprint, c.lengths, c.records.size());
    out.reserve(out.size() + c.records.size() * (12 + 16 * static_cast<std::size_t>(c.lengths)));
    for (const auto& r : c.records) {
        put(out, r.variant);
        put(out, r.a);
        put(out, r.b);
        for (std::uint32_t k = 0; k < c.lengths; ++k) {
            put(out, r.margin[k]);
            put(out, r.bound[k]);
        }
    }
    write_atomically(path, out);
}

Checkpoint load_checkpoint(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError(fmt::format("{}: cannot read the checkpoint", path));
    std::string data((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    auto bad = [&](const char* why) { return InputError(fmt::format("{}: not a usable hunt checkpoint ({})", path, why)); };
    std::size_t pos = 0;
    auto line = [&]() {
        std::size_t nl = data.find('\n', pos);
        if (nl == std::string::npos) throw bad("header cut short");
        std::string l = data.substr(pos, nl - pos);
        pos = nl + 1;
        return l;
    };
    if (line() != "overshoot hunt checkpoint 1") throw bad("unknown header");
    Checkpoint c;
    unsigned long long fp = 0, lengths = 0, records = 0;
    if (std::sscanf(line().c_str(), "fingerprint %llx", &fp) != 1) throw bad("no fingerprint");
    if (std::sscanf(line().c_str(), "lengths %llu", &lengths) != 1) throw bad("no length count");
    if (std::sscanf(line().c_str(), "records %llu", &records) != 1) throw bad("no record count");
    c.fingerprint = fp;
    c.lengths = static_cast<std::uint32_t>(lengths);
    const std::size_t each = 12 + 16 * static_cast<std::size_t>(lengths);
    if (data.size() - pos != records * each) throw bad("its size does not match its header");
    c.records.resize(records);
    for (auto& r : c.records) {
        std::memcpy(&r.variant, data.data() + pos, 4);
        std::memcpy(&r.a, data.data() + pos + 4, 4);
        std::memcpy(&r.b, data.data() + pos + 8, 4);
        pos += 12;
        r.margin.resize(lengths);
        r.bound.resize(lengths);
        for (std::size_t k = 0; k < lengths; ++k) {
            std::memcpy(&r.margin[k], data.data() + pos, 8);
            std::memcpy(&r.bound[k], data.data() + pos + 8, 8);
            pos += 16;
        }
    }
    return c;
}

}  // namespace overshoot
