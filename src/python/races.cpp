// race, certify and check for Python: races of several pieces, certificates
// written and re-checked; to_dict() is the CLI's JSON, from src/render.
#include <fmt/format.h>

#include <memory>

#include "certify/certificate.hpp"
#include "chain/chain.hpp"
#include "core/error.hpp"
#include "core/io.hpp"
#include "python/common.hpp"
#include "race/several_pieces.hpp"
#include "render/certificate.hpp"
#include "render/several_pieces.hpp"

namespace overshoot::python {

namespace {

struct RaceOutcome {
    Setup setup;
    RaceOrder order = RaceOrder::simultaneous;
    std::vector<int> starts;
    RaceResult result;
    nlohmann::json json() const {
        render::RaceView view{&setup.board, order, &setup.options, starts, &result};
        return render::race_json(view);
    }
};

struct CheckOutcome {
    Certificate cert;
    CheckReport report;
};

ClaimKind claim_kind(const std::string& kind) {
    if (kind == "cycle") return ClaimKind::cycle;
    if (kind == "crossover") return ClaimKind::crossover;
    if (kind == "winner") return ClaimKind::winner;
    throw InputError(fmt::format("unknown claim '{}': use cycle, crossover or winner", kind));
}

std::string certificate_text(const Certificate& c, const std::string& format) {
    if (format == "json") return render::certificate_json(c).dump(1) + "\n";  // as `overshoot certify`
    if (format == "md") return render::certificate_markdown(c);
    if (format == "latex") return render::certificate_latex(c);
    throw InputError(fmt::format("format '{}': expected json, md or latex", format));
}

void bind_race(py::module_& m) {
    using R = std::shared_ptr<RaceOutcome>;
    py::class_<RaceOutcome, R>(m, "RaceResult", R"doc(A race of 2 to 6 pieces (overshoot.race).

p_wins[i]: piece i finishes first alone; p_shares[i]: piece i is among several
first finishers; each within probability_error_bound.)doc")
        .def_property_readonly("names", [](const R& r) {
            std::vector<std::string> n;
            for (const auto& o : r->setup.options) n.push_back(o.name);
            return n;
        })
        .def_property_readonly("p_wins", [](const R& r) { return array<double>(r->result.p_wins); })
        .def_property_readonly("p_shares", [](const R& r) { return array<double>(r->result.p_shares); })
        .def_property_readonly("p_tie", [](const R& r) { return static_cast<double>(r->result.p_tie); })
        .def_property_readonly("p_neither", [](const R& r) { return static_cast<double>(r->result.p_neither); })
        .def_property_readonly("probability_error_bound", [](const R& r) { return static_cast<double>(r->result.bound); })
        .def_property_readonly("target_met", [](const R& r) { return r->result.target_met; })
        .def_property_readonly("method", [](const R& r) { return std::string(to_string(r->result.method)); })
        .def("to_dict", [](const R& r) { return to_python(r->json()); },
             "The document `overshoot race --json` prints, as dicts and lists.");

    m.def(
        "race",
        [](const py::args& options, const std::string& order, std::vector<int> starts, std::optional<int> length,
           std::optional<std::string> overshoot, py::object jumps, std::optional<std::string> scenario,
           py::object board) {
            auto r = std::make_shared<RaceOutcome>();
            r->setup = make_setup(options, {length, overshoot, jumps, std::nullopt, scenario, board}, 2, max_race_pieces);
            r->order = parse_race_order(order);
            if (!starts.empty() && starts.size() != r->setup.options.size())
                throw InputError(fmt::format("starts has {} squares for {} pieces: give one per piece, in order",
                                             starts.size(), r->setup.options.size()));
            r->starts = starts;
            std::vector<int> resolved;
            for (int st : starts) resolved.push_back(resolve_start(r->setup.board, st));
            py::gil_scoped_release unlocked;
            std::vector<Chain> chains;
            for (const auto& o : r->setup.options) chains.push_back(build_chain(r->setup.board, o));
            std::vector<const Chain*> ptr;
            for (const auto& c : chains) ptr.push_back(&c);
            r->result = race(ptr, resolved, r->order);
            return r;
        },
        py::kw_only(), py::arg("order") = "simultaneous", py::arg("starts") = std::vector<int>{},
        py::arg("length") = py::none(), py::arg("overshoot") = py::none(), py::arg("jumps") = py::none(),
        py::arg("scenario") = py::none(), py::arg("board") = py::none(),
        R"doc(race(*options, order="simultaneous", starts=(), length=None, overshoot=None, jumps=None, scenario=None, board=None) -> RaceResult

A race of 2 to 6 pieces, one option each, as `overshoot race --json`: order is
"simultaneous" (same-round finishers share) or "seated" (listed order, the
first to land wins); starts gives each piece's start square.)doc");
}

void bind_certificates(py::module_& m) {
    static py::exception<ClaimFailure> claim_failure(m, "ClaimFailure", PyExc_Exception);
    claim_failure.doc() = "The claim does not hold (or is undecided at the proven bounds): no certificate.";
    py::register_exception_translator([](std::exception_ptr p) {
        try {
            if (p) std::rethrow_exception(p);
        } catch (const ClaimFailure& e) {
            PyErr_SetString(claim_failure.ptr(), e.what());
        }
    });

    using C = std::shared_ptr<Certificate>;
    py::class_<Certificate, C>(m, "Certificate", R"doc(A certificate (overshoot.certify): a claim, its board and the
duels it rests on, with exact fractions where exact mode can and proven intervals
always (docs/certificate.md).)doc")
        .def_property_readonly("kind", [](const C& c) { return std::string(to_string(c->claim.kind)); })
        .def_property_readonly("options", [](const C& c) { return c->claim.options; })
        .def_property_readonly("statement", [](const C& c) { return c->statement; })
        .def_property_readonly("board", [](const C& c) { return c->board; })
        .def_property_readonly("margins",
                               [](const C& c) {
                                   py::list out;
                                   for (const auto& d : c->duels)
                                       out.append(py::make_tuple(d.a, d.b, d.length,
                                                                 d.margin.exact ? fraction(*d.margin.exact) : py::none(),
                                                                 d.margin.lo, d.margin.hi));
                                   return out;
                               },
                               "per duel: (a, b, length, exact margin or None, lower bound, upper bound)")
        .def("to_dict", [](const C& c) { return to_python(render::certificate_json(*c)); },
             "The certificate document `overshoot certify` writes, as dicts and lists.")
        .def("text", [](const C& c, const std::string& format) { return certificate_text(*c, format); },
             py::arg("format") = "json", "The certificate as `overshoot certify --format` writes it: json, md or latex.")
        .def(
            "write",
            [](const C& c, const std::string& path, const std::string& format) {
                std::string text = certificate_text(*c, format);
                py::gil_scoped_release unlocked;
                write_atomically(path, text);
            },
            py::arg("path"), py::arg("format") = "json", "Writes the certificate (atomically) as `certify -o PATH`.");

    m.def(
        "certify",
        [](const std::string& kind, const py::args& options, std::optional<int> at, int threads, bool residual,
           std::optional<int> length, std::optional<std::string> overshoot, py::object jumps,
           std::optional<std::string> order, std::optional<std::string> scenario, py::object board) {
            Claim claim;
            claim.kind = claim_kind(kind);
            if (threads < 0) throw InputError("threads must be 0 (all cores) or more");
            if (claim.kind == ClaimKind::crossover) {
                if (!at) throw InputError("certify crossover: give at=LENGTH (the preference differs at LENGTH-1 and LENGTH)");
                if (length && *length != *at)
                    throw InputError(fmt::format("certify crossover: length {} differs from at {}; give only at", *length, *at));
                length = at;
            }
            const std::size_t lo = claim.kind == ClaimKind::cycle ? 3 : 2;
            const std::size_t hi = claim.kind == ClaimKind::crossover ? 2 : 1000;
            Setup s = make_setup(options, {length, overshoot, jumps, order, scenario, board}, lo, hi);
            claim.at = at.value_or(0);
            for (const auto& o : s.options) claim.options.push_back(o.name);
            py::gil_scoped_release unlocked;
            return std::make_shared<Certificate>(certify(claim, s.board, s.order, s.options, threads, residual));
        },
        py::arg("kind"), py::kw_only(), py::arg("at") = py::none(), py::arg("threads") = 0,
        py::arg("residual") = false, OVERSHOOT_BOARD_KWARGS,
        R"doc(certify(kind, *options, at=None, threads=0, residual=False, length=None, ...) -> Certificate

kind is "cycle" (each option beats the next, the last the first), "crossover"
(A and B swap preference between at-1 and at) or "winner" (the first option
beats every other). residual=True proves intervals on boards where pieces move
backward by a residual certificate even where exact elimination fits, as
`certify --residual`. Raises ClaimFailure when the claim does not hold.)doc");

    using K = std::shared_ptr<CheckOutcome>;
    py::class_<CheckOutcome, K>(m, "CheckReport", "The independent re-check of a certificate (overshoot.check).")
        .def_property_readonly("holds", [](const K& k) { return k->report.holds; })
        .def_property_readonly("failure", [](const K& k) { return k->report.failure; },
                               "the first failing item and why ('' when it holds)")
        .def_property_readonly("passed",
                               [](const K& k) {
                                   std::vector<std::pair<std::string, std::string>> v;
                                   for (const auto& i : k->report.passed) v.emplace_back(i.item, i.detail);
                                   return v;
                               })
        .def_property_readonly("primes", [](const K& k) { return k->report.primes; })
        .def("__bool__", [](const K& k) { return k->report.holds; })
        .def("to_dict", [](const K& k) { return to_python(render::check_json(k->cert, k->report)); },
             "The document `overshoot check --json` prints, as dicts and lists.");

    m.def(
        "check",
        [](const std::string& path, int threads) {
            if (threads < 0) throw InputError("threads must be 0 (all cores) or more");
            py::gil_scoped_release unlocked;
            auto k = std::make_shared<CheckOutcome>();
            const std::string text = read_file(path);
            k->cert = parse_certificate(text, path);
            k->report = check_certificate(k->cert, text, threads);
            return k;
        },
        py::arg("path"), py::arg("threads") = 0,
        R"doc(check(path, threads=0) -> CheckReport

Re-derives every number of a certificate file by other algorithms than the
writer's (docs/certificate.md), as `overshoot check --json`. A certificate that
fails gives holds == False and the reason in failure; an unreadable file raises
ValueError.)doc");
}

}  // namespace

void bind_races(py::module_& m) {
    bind_race(m);
    bind_certificates(m);
}

}  // namespace overshoot::python
