// Reading certificate JSON (docs/certificate.md) into plain data. Every
// missing or mistyped field is an InputError naming the field.
#include <fmt/format.h>

#include <nlohmann/json.hpp>
#include <numeric>
#include <set>

#include "certify/certificate.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/fraction.hpp"

namespace overshoot {

namespace {

using nlohmann::json;

struct Reader {
    std::string source;

    [[noreturn]] void fail(const std::string& path, const std::string& what) const {
        throw InputError(fmt::format("{}: field '{}': {}", source, path, what));
    }
    const json& field(const json& obj, const std::string& path, const char* key) const {
        if (!obj.is_object()) fail(path, "expected an object");
        auto it = obj.find(key);
        if (it == obj.end()) fail(path.empty() ? key : path + "." + key, "missing");
        return *it;
    }
    std::string str(const json& obj, const std::string& path, const char* key) const {
        const json& v = field(obj, path, key);
        if (!v.is_string()) fail(join(path, key), "expected a string");
        return v.get<std::string>();
    }
    long long integer(const json& obj, const std::string& path, const char* key, long long lo, long long hi) const {
        const json& v = field(obj, path, key);
        if (!v.is_number_integer()) fail(join(path, key), "expected an integer");
        long long x = v.is_number_unsigned() && v.get<unsigned long long>() > static_cast<unsigned long long>(hi)
                          ? hi + 1
                          : v.get<long long>();
        if (x < lo || x > hi) fail(join(path, key), fmt::format("must be within {}..{}", lo, hi));
        return x;
    }
    static std::string join(const std::string& path, const char* key) { return path.empty() ? key : path + "." + key; }

    std::vector<mpz_class> decimals(const json& part, const std::string& path, const char* key, int digits,
                                    std::size_t count) const {
        const json& v = field(part, path, key);
        std::string p = join(path, key);
        if (!v.is_array() || v.size() != count) fail(p, fmt::format("expected a list of {} decimals (one per state)", count));
        std::vector<mpz_class> out;
        out.reserve(count);
        for (std::size_t i = 0; i < count; ++i) {
            if (!v[i].is_string()) fail(fmt::format("{}[{}]", p, i), "expected a decimal string");
            out.push_back(parse_scaled_decimal(v[i].get<std::string>(), digits,
                                               fmt::format("{}: field '{}[{}]'", source, p, i)));
        }
        return out;
    }

    ResidualProof residual(const json& v, const std::string& p) const {
        ResidualProof proof;
        proof.rounds_digits = static_cast<int>(integer(v, p, "rounds_digits", 0, 30));
        const json& parts = field(v, p, "parts");
        if (!parts.is_array() || parts.empty() || parts.size() > 2) fail(p + ".parts", "expected a list of 1 or 2 parts");
        for (std::size_t k = 0; k < parts.size(); ++k) {
            const std::string q = fmt::format("{}.parts[{}]", p, k);
            ResidualPart part;
            const std::string first = str(parts[k], q, "first");
            if (first == "both") part.first = Mover::both;
            else if (first == "a") part.first = Mover::a;
            else if (first == "b") part.first = Mover::b;
            else fail(q + ".first", fmt::format("'{}': expected both, a or b", first));
            part.digits = static_cast<int>(integer(parts[k], q, "digits", 1, 60));
            const json& st = field(parts[k], q, "states");
            if (!st.is_array()) fail(q + ".states", "expected a list of [square of A, square of B]");
            for (std::size_t i = 0; i < st.size(); ++i) {
                const json& x = st[i];
                if (!x.is_array() || x.size() != 2 || !x[0].is_number_integer() || !x[1].is_number_integer())
                    fail(fmt::format("{}.states[{}]", q, i), "expected [square of A, square of B]");
                const long long a = x[0].get<long long>(), b = x[1].get<long long>();
                if (a < 0 || b < 0 || a > limits::max_length || b > limits::max_length)
                    fail(fmt::format("{}.states[{}]", q, i), "a square out of range");
                part.states.emplace_back(static_cast<int>(a), static_cast<int>(b));
            }
            const std::size_t n = part.states.size();
            part.p_a_wins = decimals(parts[k], q, "p_a_wins", part.digits, n);
            part.p_b_wins = decimals(parts[k], q, "p_b_wins", part.digits, n);
            if (part.first == Mover::both) part.p_tie = decimals(parts[k], q, "p_tie", part.digits, n);
            part.rounds = decimals(parts[k], q, "rounds", proof.rounds_digits, n);
            proof.parts.push_back(std::move(part));
        }
        return proof;
    }

    CertValue value(const json& obj, const std::string& path, const char* key) const {
        const json& v = field(obj, path, key);
        std::string p = join(path, key);
        CertValue out;
        if (v.contains("exact")) {
            const json& e = v["exact"];
            if (!e.is_string()) fail(p + ".exact", "expected a string num/den");
            out.exact = parse_fraction(e.get<std::string>(), fmt::format("{}: field '{}.exact'", source, p));
        }
        out.decimal = str(v, p, "decimal");
        const json& iv = field(v, p, "interval");
        if (!iv.is_array() || iv.size() != 2 || !iv[0].is_number() || !iv[1].is_number())
            fail(p + ".interval", "expected [lo, hi] (two numbers)");
        out.lo = iv[0].get<double>();
        out.hi = iv[1].get<double>();
        if (!(out.lo <= out.hi)) fail(p + ".interval", "lo exceeds hi");
        return out;
    }
};

}  // namespace

Certificate parse_certificate(const std::string& text, const std::string& source) {
    Reader r{source};
    json j;
    try {
        j = json::parse(text);
    } catch (const json::parse_error& e) {
        throw InputError(fmt::format("{}: not valid JSON (byte {})", source, e.byte));
    } catch (const json::exception& e) {
        // A number too large for a double (e.g. 1e400) is out_of_range, not parse_error.
        throw InputError(fmt::format("{}: not readable JSON ({})", source, e.what()));
    }
    if (!j.is_object()) throw InputError(fmt::format("{}: a certificate is a JSON object", source));
    std::string schema = r.str(j, "", "schema");
    if (schema != "overshoot.certificate/1")
        r.fail("schema", fmt::format("'{}' is not overshoot.certificate/1", schema));
    Certificate c;
    // Board.
    const json& b = r.field(j, "", "board");
    int length = static_cast<int>(r.integer(b, "board", "length", 1, limits::max_length));
    Overshoot rule;
    Order order;
    try {
        rule = parse_overshoot(r.str(b, "board", "overshoot"));
        order = parse_order(r.str(b, "board", "order"));
    } catch (const InputError& e) {
        r.fail("board", e.what());
    }
    const json& jl = r.field(b, "board", "jumps");
    if (!jl.is_array()) r.fail("board.jumps", "expected a list of [from, to]");
    std::vector<Jump> jumps;
    for (std::size_t i = 0; i < jl.size(); ++i) {
        const json& x = jl[i];
        if (!x.is_array() || x.size() != 2 || !x[0].is_number_integer() || !x[1].is_number_integer())
            r.fail(fmt::format("board.jumps[{}]", i), "expected [from, to]");
        jumps.push_back({x[0].get<int>(), x[1].get<int>()});
    }
    try {
        c.board = make_board(length, rule, jumps);
    } catch (const InputError& e) {
        r.fail("board", e.what());
    }
    c.order = order;
    // Claim.
    const json& cl = r.field(j, "", "claim");
    std::string kind = r.str(cl, "claim", "kind");
    if (kind == "cycle") c.claim.kind = ClaimKind::cycle;
    else if (kind == "crossover") c.claim.kind = ClaimKind::crossover;
    else if (kind == "winner") c.claim.kind = ClaimKind::winner;
    else r.fail("claim.kind", fmt::format("'{}': expected cycle, crossover or winner", kind));
    const json& co = r.field(cl, "claim", "options");
    if (!co.is_array()) r.fail("claim.options", "expected a list of option names");
    for (const json& x : co) {
        if (!x.is_string()) r.fail("claim.options", "expected option names (strings)");
        c.claim.options.push_back(x.get<std::string>());
    }
    if (c.claim.kind == ClaimKind::crossover)
        c.claim.at = static_cast<int>(r.integer(cl, "claim", "at", 2, limits::max_length));
    c.statement = r.str(cl, "claim", "statement");
    // Options.
    const json& jo = r.field(j, "", "options");
    if (!jo.is_array()) r.fail("options", "expected a list");
    std::set<std::string> names;
    for (std::size_t i = 0; i < jo.size(); ++i) {
        std::string p = fmt::format("options[{}]", i);
        Option o;
        o.name = r.str(jo[i], p, "name");
        o.spec = r.str(jo[i], p, "spec");
        if (!names.insert(o.name).second) r.fail(p + ".name", fmt::format("'{}' is listed twice", o.name));
        const json& den = r.field(jo[i], p, "denominator");
        if (!den.is_number_unsigned() || den.get<std::uint64_t>() == 0 || den.get<std::uint64_t>() > limits::max_denominator)
            r.fail(p + ".denominator", "expected a positive integer below 2^62");
        o.denominator = den.get<std::uint64_t>();
        const json& mv = r.field(jo[i], p, "moves");
        if (!mv.is_array() || mv.empty()) r.fail(p + ".moves", "expected a non-empty list of [move, weight]");
        std::uint64_t total = 0;
        int last = -1;
        for (std::size_t k = 0; k < mv.size(); ++k) {
            const json& x = mv[k];
            std::string q = fmt::format("{}.moves[{}]", p, k);
            if (!x.is_array() || x.size() != 2 || !x[0].is_number_unsigned() || !x[1].is_number_unsigned())
                r.fail(q, "expected [move, weight] (non-negative integers)");
            auto m = x[0].get<std::uint64_t>();
            auto w = x[1].get<std::uint64_t>();
            if (m > static_cast<std::uint64_t>(limits::max_move)) r.fail(q, "move exceeds the limit");
            if (static_cast<int>(m) <= last) r.fail(q, "moves must be increasing");
            if (w == 0 || w > limits::max_denominator) r.fail(q, "weight must be positive and below 2^62");
            last = static_cast<int>(m);
            o.weight.resize(m + 1, 0);
            o.weight[m] = w;
            total += w;
            if (total > limits::max_denominator) r.fail(p + ".moves", "weights sum past 2^62");
        }
        if (total != o.denominator)
            r.fail(p + ".denominator", fmt::format("{} differs from the sum of the weights, {}", o.denominator, total));
        c.options.push_back(std::move(o));
    }
    // Head starts (optional): {"name": square}, each a square a piece can rest on.
    if (b.contains("head_starts")) {
        const json& hs = b["head_starts"];
        if (!hs.is_object()) r.fail("board.head_starts", "expected an object {\"option name\": square}");
        c.starts.assign(c.options.size(), 0);
        for (auto it = hs.begin(); it != hs.end(); ++it) {
            const std::string q = fmt::format("board.head_starts.{}", it.key());
            std::size_t i = 0;
            while (i < c.options.size() && c.options[i].name != it.key()) ++i;
            if (i == c.options.size()) r.fail(q, "not among the options");
            if (!it.value().is_number_unsigned() || it.value().get<std::uint64_t>() == 0 ||
                it.value().get<std::uint64_t>() >= static_cast<std::uint64_t>(c.board.length))
                r.fail(q, fmt::format("expected a square 1..{}", c.board.length - 1));
            c.starts[i] = it.value().get<int>();
            try {
                resolve_start(c.board, c.starts[i]);
            } catch (const InputError& e) {
                r.fail(q, e.what());
            }
        }
    }
    // Duels.
    const json& jd = r.field(j, "", "duels");
    if (!jd.is_array()) r.fail("duels", "expected a list");
    for (std::size_t i = 0; i < jd.size(); ++i) {
        std::string p = fmt::format("duels[{}]", i);
        CertDuel d;
        d.a = r.str(jd[i], p, "a");
        d.b = r.str(jd[i], p, "b");
        for (const auto* n : {&d.a, &d.b})
            if (!names.count(*n)) r.fail(p, fmt::format("option '{}' is not among the options", *n));
        d.length = static_cast<int>(r.integer(jd[i], p, "length", 1, limits::max_length));
        std::string v = r.str(jd[i], p, "verdict");
        if (v == "a beats b") d.verdict = Verdict::a_beats_b;
        else if (v == "b beats a") d.verdict = Verdict::b_beats_a;
        else if (v == "undecided") d.verdict = Verdict::undecided;
        else r.fail(p + ".verdict", fmt::format("'{}': expected 'a beats b', 'b beats a' or 'undecided'", v));
        d.interval_method = r.str(jd[i], p, "interval_method");
        const json& em = r.field(jd[i], p, "exact_method");
        if (!em.is_null() && !em.is_string()) r.fail(p + ".exact_method", "expected a string or null");
        if (em.is_string()) d.exact_method = em.get<std::string>();
        d.p_a_wins = r.value(jd[i], p, "p_a_wins");
        d.p_b_wins = r.value(jd[i], p, "p_b_wins");
        d.p_tie = r.value(jd[i], p, "p_tie");
        d.p_neither = r.value(jd[i], p, "p_neither");
        d.margin = r.value(jd[i], p, "margin");
        if (jd[i].contains("residual")) d.residual = r.residual(jd[i]["residual"], p + ".residual");
        const bool has = !d.exact_method.empty();
        for (const CertValue* x : {&d.p_a_wins, &d.p_b_wins, &d.p_tie, &d.p_neither, &d.margin})
            if (x->exact.has_value() != has)
                r.fail(p, has ? "exact_method is given but a value has no exact fraction"
                              : "a value has an exact fraction but exact_method is null");
        c.duels.push_back(std::move(d));
    }
    return c;
}

}  // namespace overshoot
