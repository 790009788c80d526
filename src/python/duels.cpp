// profile, duel and tournament for Python: the library's calls composed as the
// command line composes them, results as objects whose to_dict() is the CLI's
// JSON (rendered by src/render, not rebuilt here).
#include <fmt/format.h>

#include <memory>

#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "core/error.hpp"
#include "python/common.hpp"
#include "race/duel.hpp"
#include "race/exact.hpp"
#include "race/long_duel.hpp"
#include "render/exact.hpp"
#include "render/duel.hpp"
#include "render/profile.hpp"
#include "render/tournament.hpp"
#include "tournament/tournament.hpp"

namespace overshoot::python {

namespace {

struct ProfileOutcome {
    Setup setup;
    std::vector<Profile> profiles;
    nlohmann::json json() const {
        std::vector<render::ProfileEntry> entries;
        for (std::size_t i = 0; i < profiles.size(); ++i) entries.push_back({&setup.options[i], profiles[i]});
        return render::profile_json(setup.board, setup.order, entries);
    }
};

struct DuelOutcome {
    Setup setup;
    DuelResult result;
    std::optional<ExactDuel> exact;
    nlohmann::json json() const {
        return render::duel_json(setup.board, setup.order, setup.options[0], setup.options[1], result, setup.starts,
                                 exact ? &*exact : nullptr);
    }
};

struct TournamentOutcome {
    Tournament t;
    render::TournamentSource src;
    std::optional<std::vector<std::optional<ExactDuel>>> exact;
    nlohmann::json json() const {
        auto j = render::tournament_json(t, src);
        if (exact) j["exact"] = render::exact_matrix_json(*exact, t.size());
        return j;
    }
};

py::object maybe(double x) { return std::isnan(x) ? py::none() : py::cast(x); }
template <class T>
py::object maybe(const std::optional<T>& x) {
    return x ? py::cast(*x) : py::none();
}

py::object exact_matrix(const std::optional<std::vector<std::optional<ExactDuel>>>& m, std::size_t n, bool margins) {
    if (!m) return py::none();
    py::list rows;
    for (std::size_t i = 0; i < n; ++i) {
        py::list row;
        for (std::size_t j = 0; j < n; ++j) {
            const auto& e = (*m)[i * n + j];
            row.append(e ? fraction(margins ? mpq_class(e->margin()) : e->p_a_wins) : py::none());
        }
        rows.append(row);
    }
    return rows;
}

void bind_profile(py::module_& m) {
    using P = std::shared_ptr<ProfileOutcome>;
    auto each = [](const P& o, auto f) {
        std::vector<double> v;
        for (const auto& p : o->profiles) v.push_back(f(p));
        return array<double>(v);
    };
    py::class_<ProfileOutcome, P>(m, "ProfileResult", "Each option alone on the board (overshoot.profile).")
        .def_property_readonly("names", [](const P& o) {
            std::vector<std::string> n;
            for (const auto& x : o->setup.options) n.push_back(x.name);
            return n;
        })
        .def_property_readonly("board", [](const P& o) { return o->setup.board; })
        .def_property_readonly("p_finish", [each](const P& o) { return each(o, [](const Profile& p) { return p.p_finish; }); },
                               "P(the option ever finishes), one per option (NumPy array)")
        .def_property_readonly("p_stuck", [each](const P& o) { return each(o, [](const Profile& p) { return p.p_stuck; }); })
        .def_property_readonly("mean_turns_given_finish",
                               [each](const P& o) { return each(o, [](const Profile& p) { return p.mean_turns_given_finish; }); },
                               "mean turns over the races that finish (NaN when none does)")
        .def_property_readonly("sd_turns_given_finish",
                               [each](const P& o) { return each(o, [](const Profile& p) { return p.sd_turns_given_finish; }); })
        .def_property_readonly(
            "quantiles",
            [](const P& o) {
                py::list per_option;
                for (const auto& p : o->profiles) {
                    py::dict d;
                    for (const auto& q : p.quantiles) d[py::float_(q.q)] = maybe(q.turns);
                    per_option.append(d);
                }
                return per_option;
            },
            "per option, {q: turns or None}; the median (0.5) is always there")
        .def_property_readonly("stuck_squares", [](const P& o) {
            std::vector<std::vector<int>> v;
            for (const auto& p : o->profiles) v.push_back(p.stuck_squares);
            return v;
        })
        .def("to_dict", [](const P& o) { return to_python(o->json()); },
             "The document `overshoot profile --json` prints, as dicts and lists.");

    m.def(
        "profile",
        [](const py::args& options, const std::vector<double>& quantiles, std::optional<int> length,
           std::optional<std::string> overshoot, py::object jumps, std::optional<std::string> order,
           std::optional<std::string> scenario, py::object board) {
            auto o = std::make_shared<ProfileOutcome>();
            o->setup = make_setup(options, {length, overshoot, jumps, order, scenario, board}, 1, 1000);
            ProfileSettings ps;
            ps.quantiles = {0.5};
            for (double q : quantiles) {
                if (!(q > 0 && q < 1)) throw InputError(fmt::format("quantile {}: must lie strictly between 0 and 1", q));
                if (q != 0.5) ps.quantiles.push_back(q);
            }
            py::gil_scoped_release unlocked;
            for (const auto& opt : o->setup.options) o->profiles.push_back(profile(build_chain(o->setup.board, opt), ps));
            return o;
        },
        py::arg("quantiles") = std::vector<double>{}, OVERSHOOT_BOARD_KWARGS,
        R"doc(profile(*options, quantiles=(), length=None, overshoot=None, jumps=None, order=None, scenario=None, board=None) -> ProfileResult

Each option alone: chance of finishing, mean and spread of the finishing turn,
median and other quantiles, stuck squares. As `overshoot profile --json`.)doc");
}

void bind_duel(py::module_& m) {
    using D = std::shared_ptr<DuelOutcome>;
    py::class_<ExactDuel>(m, "ExactDuel", "Every outcome of a duel as an exact fractions.Fraction.")
        .def_property_readonly("p_a_wins", [](const ExactDuel& e) { return fraction(e.p_a_wins); })
        .def_property_readonly("p_b_wins", [](const ExactDuel& e) { return fraction(e.p_b_wins); })
        .def_property_readonly("p_tie", [](const ExactDuel& e) { return fraction(e.p_tie); })
        .def_property_readonly("p_neither", [](const ExactDuel& e) { return fraction(e.p_neither); })
        .def_property_readonly("margin", [](const ExactDuel& e) { return fraction(mpq_class(e.margin())); })
        .def_readonly("method", &ExactDuel::method);
    py::class_<DuelOutcome, D>(m, "DuelResult", R"doc(Two options on one board (overshoot.duel).

Each probability lies within probability_error_bound of its true value;
margin = p_a_wins - p_b_wins within error_bound. `exact` holds fractions when
asked for with exact=True, else None.)doc")
        .def_property_readonly("a", [](const D& d) { return d->setup.options[0]; })
        .def_property_readonly("b", [](const D& d) { return d->setup.options[1]; })
        .def_property_readonly("board", [](const D& d) { return d->setup.board; })
        .def_property_readonly("order", [](const D& d) { return std::string(to_string(d->setup.order)); })
        .def_property_readonly("p_a_wins", [](const D& d) { return static_cast<double>(d->result.p_a_wins); })
        .def_property_readonly("p_b_wins", [](const D& d) { return static_cast<double>(d->result.p_b_wins); })
        .def_property_readonly("p_tie", [](const D& d) { return static_cast<double>(d->result.p_tie); })
        .def_property_readonly("p_neither", [](const D& d) { return static_cast<double>(d->result.p_neither); })
        .def_property_readonly("margin", [](const D& d) { return d->result.margin(); })
        .def_property_readonly("error_bound", [](const D& d) { return d->result.error_bound(); })
        .def_property_readonly("probability_error_bound", [](const D& d) { return static_cast<double>(d->result.bound); })
        .def_property_readonly("bound_proven", [](const D& d) { return d->result.bound_proven; })
        .def_property_readonly("target_met", [](const D& d) { return d->result.target_met; })
        .def_property_readonly("method", [](const D& d) { return to_string(d->result.method); })
        .def_property_readonly("mean_rounds", [](const D& d) { return maybe(d->result.mean_rounds); })
        .def_property_readonly("median_rounds", [](const D& d) {
            return d->result.median_resolved ? maybe(d->result.median_rounds) : py::none();
        })
        .def_property_readonly("a_beats_b", [](const D& d) { return d->result.a_beats_b(); })
        .def_property_readonly("b_beats_a", [](const D& d) { return d->result.b_beats_a(); })
        .def_property_readonly("exact", [](const D& d) { return maybe(d->exact); })
        .def("to_dict", [](const D& d) { return to_python(d->json()); },
             "The document `overshoot duel --json` (with --exact when exact=True) prints, as dicts and lists.");

    m.def(
        "duel",
        [](py::object a, py::object b, bool exact, const std::string& method, std::optional<int> length,
           std::optional<std::string> overshoot, py::object jumps, std::optional<std::string> order,
           std::optional<std::string> scenario, py::object board) {
            auto d = std::make_shared<DuelOutcome>();
            d->setup = make_setup(py::make_tuple(a, b), {length, overshoot, jumps, order, scenario, board}, 2, 2);
            DuelSettings ds;
            ds.method = parse_duel_method(method);
            py::gil_scoped_release unlocked;
            // As `overshoot duel`: long boards need no chain when the finishing windows lie apart.
            const Board& bd = d->setup.board;
            d->result = duel_on_board(bd, d->setup.options[0], d->setup.options[1], 0, 0, d->setup.order, ds);
            if (exact)
                d->exact = exact_duel(build_chain(bd, d->setup.options[0]), build_chain(bd, d->setup.options[1]),
                                      d->setup.order);
            return d;
        },
        py::arg("a"), py::arg("b"), py::kw_only(), py::arg("exact") = false, py::arg("method") = "auto",
        OVERSHOOT_BOARD_KWARGS,
        R"doc(duel(a, b, *, exact=False, method="auto", length=None, overshoot=None, jumps=None, order=None, scenario=None, board=None) -> DuelResult

P(A finishes first), P(B first), P(tie), P(neither) with a proven bound, as
`overshoot duel --json`; exact=True adds every probability as a Fraction (or
raises LimitError where exact mode cannot go). Options are spec strings,
scenario names or Option objects.)doc");
}

void bind_tournament(py::module_& m) {
    using T = std::shared_ptr<TournamentOutcome>;
    py::class_<Cycle>(m, "Cycle", "Each option beats the next, the last beats the first (indices into names).")
        .def_readonly("options", &Cycle::options)
        .def_readonly("strength", &Cycle::strength, "the smallest margin along the cycle");
    auto n = [](const T& t) { return t->t.size(); };
    py::class_<TournamentOutcome, T>(m, "TournamentResult", R"doc(Every option against every other (overshoot.tournament).

Matrices are n x n NumPy arrays indexed [row, column] in the order of `names`;
other fields give option indices.)doc")
        .def_property_readonly("names", [](const T& t) { return t->t.matrix.names; })
        .def_property_readonly("win", [n](const T& t) { return matrix<double>(t->t.matrix.win, n(t), n(t)); },
                               "P(row finishes before column)")
        .def_property_readonly("tie", [n](const T& t) { return matrix<double>(t->t.matrix.tie, n(t), n(t)); })
        .def_property_readonly("neither", [n](const T& t) { return matrix<double>(t->t.matrix.neither, n(t), n(t)); })
        .def_property_readonly("margin", [n](const T& t) { return matrix<double>(t->t.margin, n(t), n(t)); },
                               "win - win.T")
        .def_property_readonly("bound", [n](const T& t) { return matrix<double>(t->t.matrix.bound, n(t), n(t)); },
                               "bound on each margin")
        .def_property_readonly("beats", [n](const T& t) { return matrix<bool>(t->t.beats, n(t), n(t)); },
                               "True where row beats column (|margin| > bound)")
        .def_property_readonly("copeland", [](const T& t) { return array<double>(t->t.copeland); })
        .def_property_readonly("condorcet_winner", [](const T& t) { return maybe(t->t.condorcet_winner); })
        .def_property_readonly("condorcet_loser", [](const T& t) { return maybe(t->t.condorcet_loser); })
        .def_property_readonly("top_cycle", [](const T& t) { return t->t.top_cycle; })
        .def_property_readonly("components", [](const T& t) { return t->t.components; })
        .def_property_readonly("undecided", [](const T& t) { return t->t.undecided; })
        .def_property_readonly("transitive", [](const T& t) { return t->t.transitive; })
        .def_property_readonly("cycles", [](const T& t) { return t->t.cycles; }, "strongest first")
        .def_property_readonly("strongest_cycle", [](const T& t) { return maybe(t->t.strongest_cycle); })
        .def_property_readonly("equilibrium", [](const T& t) { return array<double>(t->t.equilibrium.weight); },
                               "the optimal mixed choice: a weight per option")
        .def_property_readonly("exact_win", [n](const T& t) { return exact_matrix(t->exact, n(t), false); },
                               "with exact=True: P(row beats column) as Fractions (None on the diagonal)")
        .def_property_readonly("exact_margin", [n](const T& t) { return exact_matrix(t->exact, n(t), true); })
        .def("to_dict", [](const T& t) { return to_python(t->json()); },
             "The document `overshoot tournament --json` (with --exact when exact=True) prints.");

    m.def(
        "tournament",
        [](const py::args& options, bool exact, const std::string& method, int threads, int max_cycle_length,
           long long cycle_cap, std::optional<int> length, std::optional<std::string> overshoot, py::object jumps,
           std::optional<std::string> order, std::optional<std::string> scenario, py::object board) {
            if (cycle_cap < 0) throw InputError("cycle_cap must be 0 or more");
            if (threads < 0) throw InputError("threads must be 0 (all cores) or more");
            auto t = std::make_shared<TournamentOutcome>();
            Setup s = make_setup(options, {length, overshoot, jumps, order, scenario, board}, 1, 100'000);
            TournamentSettings settings;
            settings.max_cycle_length = max_cycle_length;
            settings.cycle_cap = static_cast<std::size_t>(cycle_cap);
            DuelSettings ds;
            ds.method = parse_duel_method(method);
            ds.want_median = false;  // as the CLI: no race lengths reported
            py::gil_scoped_release unlocked;
            PairwiseMatrix pm = race_matrix(s.board, s.order, s.options, ds, threads);
            if (exact) {
                std::vector<Chain> chains;
                for (const auto& o : s.options) chains.push_back(build_chain(s.board, o));
                t->exact = exact_matrix(chains, s.order, threads);
            }
            t->t = analyse(std::move(pm), settings);
            t->src.board = s.board;
            t->src.order = s.order;
            t->src.options = s.options;
            return t;
        },
        py::kw_only(), py::arg("exact") = false, py::arg("method") = "auto", py::arg("threads") = 0,
        py::arg("max_cycle_length") = 6, py::arg("cycle_cap") = 10'000, OVERSHOOT_BOARD_KWARGS,
        R"doc(tournament(*options, exact=False, method="auto", threads=0, max_cycle_length=6, cycle_cap=10000, length=None, ...) -> TournamentResult

Every option against every other on one board: win and margin matrices, the
dominance digraph's cycles, Condorcet winner, top cycle and equilibrium mix, as
`overshoot tournament --json`. threads=0 uses every core, as the CLI.)doc");
}

}  // namespace

void bind_duels(py::module_& m) {
    bind_profile(m);
    bind_duel(m);
    bind_tournament(m);
}

}  // namespace overshoot::python
