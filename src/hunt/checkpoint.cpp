#include "hunt/checkpoint.hpp"

#include <fmt/format.h>

#include <bit>
#include <cmath>
#include <cstring>
#include <fstream>
#include <iterator>
#include <sstream>

#include "core/error.hpp"
#include "core/io.hpp"

namespace overshoot {

static_assert(std::endian::native == std::endian::little, "checkpoints are written little-endian");

namespace {
template <class T>
void put(std::string& out, const T& v) {
    out.append(reinterpret_cast<const char*>(&v), sizeof v);
}
}  // namespace

std::string encode_checkpoint(const Checkpoint& c) {
    std::string out = fmt::format("overshoot hunt checkpoint 2\nfingerprint {:016x}\nlengths {}\nrecords {}\n",
                                  c.fingerprint, c.lengths, c.records.size());
    std::size_t size = out.size();
    for (const auto& r : c.records) size += 20 + 16 * r.margin.size();
    out.reserve(size);
    for (const auto& r : c.records) {
        const std::uint32_t count = static_cast<std::uint32_t>(r.margin.size());
        put(out, r.variant);
        put(out, r.a);
        put(out, r.b);
        put(out, r.first);
        put(out, count);
        for (std::uint32_t k = 0; k < count; ++k) {
            put(out, r.margin[k]);
            put(out, r.bound[k]);
        }
    }
    return out;
}

void save_checkpoint(const std::string& path, const Checkpoint& c) { write_atomically(path, encode_checkpoint(c)); }

Checkpoint decode_checkpoint(std::string_view data, const std::string& where) {
    auto bad = [&](const char* why) {
        return InputError(fmt::format("{}: not a usable hunt checkpoint ({})", where, why));
    };
    std::size_t pos = 0;
    auto line = [&]() {
        std::size_t nl = data.find('\n', pos);
        if (nl == std::string_view::npos || nl - pos > 200) throw bad("header cut short");
        std::string l(data.substr(pos, nl - pos));
        pos = nl + 1;
        return l;
    };
    const std::string head = line();
    int format = 0;
    if (head == "overshoot hunt checkpoint 1") format = 1;
    if (head == "overshoot hunt checkpoint 2") format = 2;
    if (format == 0) throw bad("unknown header");
    Checkpoint c;
    unsigned long long fp = 0, lengths = 0, records = 0;
    char tail = 0;
    if (std::sscanf(line().c_str(), "fingerprint %llx%c", &fp, &tail) != 1) throw bad("no fingerprint");
    if (std::sscanf(line().c_str(), "lengths %llu%c", &lengths, &tail) != 1) throw bad("no length count");
    if (std::sscanf(line().c_str(), "records %llu%c", &records, &tail) != 1) throw bad("no record count");
    if (lengths > 0xffffffffULL) throw bad("length count out of range");
    c.fingerprint = fp;
    c.lengths = static_cast<std::uint32_t>(lengths);
    // Every record takes at least its fixed part: a count beyond the bytes is damage.
    const std::size_t fixed = format == 1 ? 12 + 16 * static_cast<std::size_t>(lengths) : 20;
    if (records > (data.size() - pos) / fixed) throw bad("its size does not match its header");
    auto take32 = [&](std::uint32_t& v) {
        std::memcpy(&v, data.data() + pos, 4);
        pos += 4;
    };
    c.records.resize(records);
    for (auto& r : c.records) {
        if (data.size() - pos < fixed) throw bad("its size does not match its header");
        take32(r.variant);
        take32(r.a);
        take32(r.b);
        std::uint32_t count = c.lengths;
        if (format == 2) {
            take32(r.first);
            take32(count);
            if (r.first > c.lengths || count > c.lengths - r.first) throw bad("a record lies outside the lengths");
            if ((data.size() - pos) / 16 < count) throw bad("its size does not match its header");
        }
        r.margin.resize(count);
        r.bound.resize(count);
        for (std::size_t k = 0; k < count; ++k) {
            std::memcpy(&r.margin[k], data.data() + pos, 8);
            std::memcpy(&r.bound[k], data.data() + pos + 8, 8);
            pos += 16;
            // A margin lies within its bound of [-1, 1]; a bound is >= 0 (infinite when nothing was proven).
            if (!(r.bound[k] >= 0) || !(std::fabs(r.margin[k]) <= 1 + r.bound[k]))
                throw bad("a margin or bound is out of range");
        }
    }
    if (pos != data.size()) throw bad("its size does not match its header");
    return c;
}

Checkpoint load_checkpoint(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw InputError(fmt::format("{}: cannot read the checkpoint", path));
    std::string data((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    return decode_checkpoint(data, path);
}

}  // namespace overshoot
