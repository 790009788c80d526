// sweep and hunt for Python: per-length results as NumPy arrays (one array per
// quantity, no Python object per length), a hunt with a progress callback that
// Ctrl-C stops cleanly; to_dict() is the CLI's JSON, from src/render.
#include <fmt/format.h>

#include <memory>

#include "core/error.hpp"
#include "python/common.hpp"
#include "render/sweep.hpp"
#include "core/family.hpp"
#include "hunt/hunt.hpp"
#include "hunt/spec.hpp"
#include "lengths/lengths.hpp"
#include "lengths/method.hpp"
#include "sweep/sweep.hpp"

namespace overshoot::python {

namespace {

// lengths as (lo, hi), "LO..HI", a single length, or a range() with its step.
LengthGrid grid_of(const py::object& lengths, int step) {
    if (py::isinstance<py::str>(lengths)) return parse_lengths(lengths.cast<std::string>(), step);
    if (py::isinstance<py::int_>(lengths)) {
        const int n = lengths.cast<int>();
        return LengthGrid{n, n, step};
    }
    if (py::isinstance(lengths, py::module_::import("builtins").attr("range"))) {
        const int lo = lengths.attr("start").cast<int>(), stop = lengths.attr("stop").cast<int>();
        const int by = lengths.attr("step").cast<int>();
        if (by < 1 || stop <= lo) throw InputError("lengths: a range needs a positive step and at least one length");
        return LengthGrid{lo, lo + (stop - 1 - lo) / by * by, by};
    }
    auto [lo, hi] = lengths.cast<std::pair<int, int>>();
    return parse_lengths(fmt::format("{}..{}", lo, hi), step);
}

// variants as (rule, order) pairs; none: the board's rule and order.
std::vector<Variant> variants_of(const py::object& variants, Overshoot rule, Order order) {
    if (variants.is_none()) return {Variant{rule, order}};
    std::vector<Variant> out;
    for (auto v : variants) {
        auto [r, o] = v.cast<std::pair<std::string, std::string>>();
        Variant x{parse_overshoot(r), parse_order(o)};
        for (const auto& y : out)
            if (y.rule == x.rule && y.order == x.order)
                throw InputError(fmt::format("the rule variant {} / {} is listed twice", r, o));
        out.push_back(x);
    }
    return out;
}

// A cycle that holds on some lengths (a sweep's CycleSpan, a hunt's HuntCycle) as a dict.
template <class Span>
py::dict span_dict(const Span& c) {
    py::dict d;
    d["options"] = c.options;
    d["intervals"] = c.intervals;
    d["weakest"] = c.weakest;
    d["strongest"] = c.strongest;
    d["strongest_length"] = c.strongest_length;
    d["count"] = c.count;
    return d;
}

struct SweepOutcome {
    SweepResult r;
};

struct HuntOutcome {
    HuntSpec spec;
    HuntResult r;
};

template <class F>
py::array_t<double> per_pair(const VariantSweep& v, F f) {
    const std::size_t rows = v.pairs.size(), cols = v.lengths.size();
    py::array_t<double> a({static_cast<py::ssize_t>(rows), static_cast<py::ssize_t>(cols)});
    double* out = a.mutable_data();
    for (std::size_t p = 0; p < rows; ++p)
        for (std::size_t k = 0; k < cols; ++k) out[p * cols + k] = f(v.pairs[p].at[k]);
    return a;
}

void bind_sweep(py::module_& m) {
    py::class_<VariantSweep>(m, "VariantSweep", R"doc(One rule variant of a sweep.

Per-length quantities are NumPy arrays: `margin[p, k]` is the margin of
pairs[p] = (a, b) (a over b) at lengths[k]; error_bound likewise.)doc")
        .def_property_readonly("overshoot", [](const VariantSweep& v) { return std::string(to_string(v.variant.rule)); })
        .def_property_readonly("order", [](const VariantSweep& v) { return std::string(to_string(v.variant.order)); })
        .def_property_readonly("lengths", [](const VariantSweep& v) { return array<int>(v.lengths); })
        .def_property_readonly("pairs", [](const VariantSweep& v) {
            std::vector<std::pair<std::size_t, std::size_t>> p;
            for (const auto& x : v.pairs) p.emplace_back(x.a, x.b);
            return p;
        })
        .def_property_readonly("margin", [](const VariantSweep& v) { return per_pair(v, [](const LengthOutcome& o) { return o.margin(); }); })
        .def_property_readonly("error_bound", [](const VariantSweep& v) { return per_pair(v, [](const LengthOutcome& o) { return o.error_bound(); }); })
        .def_property_readonly("p_a_wins", [](const VariantSweep& v) { return per_pair(v, [](const LengthOutcome& o) { return o.p_a_wins; }); })
        .def_property_readonly("p_b_wins", [](const VariantSweep& v) { return per_pair(v, [](const LengthOutcome& o) { return o.p_b_wins; }); })
        .def_property_readonly("p_tie", [](const VariantSweep& v) { return per_pair(v, [](const LengthOutcome& o) { return o.p_tie; }); })
        .def_property_readonly(
            "condorcet_winner",
            [](const VariantSweep& v) {
                std::vector<long> w;
                for (const auto& l : v.per_length) w.push_back(l.condorcet_winner ? static_cast<long>(*l.condorcet_winner) : -1);
                return array<long>(w);
            },
            "per length, the option that beats every other, or -1")
        .def_property_readonly(
            "crossovers",
            [](const VariantSweep& v) {
                py::list out;
                for (const auto& c : v.crossovers) {
                    py::dict d;
                    d["a"] = c.a;
                    d["b"] = c.b;
                    d["before"] = c.before;
                    d["after"] = c.after;
                    d["length"] = c.length() ? py::cast(*c.length()) : py::none();
                    d["preferred_before"] = c.preferred_before;
                    d["preferred_after"] = c.preferred_after;
                    out.append(d);
                }
                return out;
            },
            "where the preference of a over b changes sign")
        .def_property_readonly(
            "cycles",
            [](const VariantSweep& v) {
                py::list out;
                for (const auto& c : v.cycles) out.append(span_dict(c));
                return out;
            },
            "strongest first; options are indices into names")
        .def_property_readonly("no_dominant", [](const VariantSweep& v) { return v.no_dominant; },
                               "runs of lengths without a Condorcet winner");

    using S = std::shared_ptr<SweepOutcome>;
    py::class_<SweepOutcome, S>(m, "SweepResult", "The same options over a range of lengths and rule variants (overshoot.sweep).")
        .def_property_readonly("names", [](const S& s) {
            std::vector<std::string> n;
            for (const auto& o : s->r.options) n.push_back(o.name);
            return n;
        })
        .def_property_readonly("lengths", [](const S& s) { return array<int>(s->r.grid.lengths()); })
        .def_property_readonly("variants", [](const S& s) { return s->r.variants; }, py::return_value_policy::copy)
        .def(
            "margin",
            [](const S& s, const py::object& a, const py::object& b, std::size_t variant) {
                auto index = [&](const py::object& x) -> std::size_t {
                    if (py::isinstance<py::int_>(x)) return x.cast<std::size_t>();
                    const auto name = x.cast<std::string>();
                    for (std::size_t i = 0; i < s->r.options.size(); ++i)
                        if (s->r.options[i].name == name) return i;
                    throw InputError(fmt::format("'{}' is not an option of this sweep", name));
                };
                const std::size_t i = index(a), j = index(b);
                if (variant >= s->r.variants.size()) throw InputError("no such variant");
                const VariantSweep& v = s->r.variants[variant];
                for (std::size_t p = 0; p < v.pairs.size(); ++p) {
                    const bool fwd = v.pairs[p].a == i && v.pairs[p].b == j, back = v.pairs[p].a == j && v.pairs[p].b == i;
                    if (!fwd && !back) continue;
                    std::vector<double> out;
                    for (const auto& o : v.pairs[p].at) out.push_back(fwd ? o.margin() : -o.margin());
                    return array<double>(out);
                }
                throw InputError("margin: give two different options of this sweep");
            },
            py::arg("a"), py::arg("b"), py::arg("variant") = 0,
            "The margin of a over b at every length (NumPy array); a and b are names or indices.")
        .def("to_dict", [](const S& s) { return to_python(render::sweep_json(s->r)); },
             "The document `overshoot sweep --json` prints, as dicts and lists.");

    m.def(
        "sweep",
        [](const py::args& options, const py::object& lengths, int step, const py::object& variants,
           const std::string& anchor, const std::string& method, int threads, int max_cycle_length,
           std::optional<std::string> overshoot, py::object jumps, std::optional<std::string> order,
           std::optional<std::string> scenario) {
            if (threads < 0) throw InputError("threads must be 0 (all cores) or more");
            SweepSpec spec;
            spec.grid = grid_of(lengths, step);
            // On the longest board of the sweep, which validates the jumps (as the CLI).
            Setup s = make_setup(options, {spec.grid.hi, overshoot, jumps, order, scenario, py::none()}, 2, 100);
            spec.options = s.options;
            spec.jumps = s.board.jumps;
            spec.anchor = parse_anchor(anchor);
            spec.variants = variants_of(variants, s.board.rule, s.order);
            for (const auto& v : spec.variants)
                if (!spec.jumps.empty() || v.rule == Overshoot::bounce) make_board(spec.grid.hi, v.rule, spec.jumps);
            spec.engine.method = parse_length_method(method);
            spec.engine.threads = threads;
            spec.max_cycle_length = max_cycle_length;
            auto out = std::make_shared<SweepOutcome>();
            std::atomic<bool> stop{false};
            spec.engine.cancel = &stop;
            run_interruptible([&] { out->r = run_sweep(spec); }, &stop);
            return out;
        },
        py::kw_only(), py::arg("lengths"), py::arg("step") = 1, py::arg("variants") = py::none(),
        py::arg("anchor") = "start", py::arg("method") = "auto", py::arg("threads") = 0,
        py::arg("max_cycle_length") = 6, py::arg("overshoot") = py::none(), py::arg("jumps") = py::none(),
        py::arg("order") = py::none(), py::arg("scenario") = py::none(),
        R"doc(sweep(*options, lengths, step=1, variants=None, anchor="start", method="auto", threads=0, max_cycle_length=6, overshoot=None, jumps=None, order=None, scenario=None) -> SweepResult

The same options raced on every length of `lengths` ((lo, hi), "LO..HI" or a
range()), for each rule variant ((overshoot, order) pairs; default the board's),
as `overshoot sweep --json`: per-length margins as NumPy arrays, crossovers,
cycle intervals, lengths with no dominant option. Ctrl-C stops it.)doc");
}

void bind_hunt(py::module_& m) {
    using H = std::shared_ptr<HuntOutcome>;
    py::class_<HuntOutcome, H>(m, "HuntResult", R"doc(Intransitive sets found by a hunt (overshoot.hunt).

cycles: ranked, each a dict with the option names, the rule variant, the length
intervals where it holds and its strength.)doc")
        .def_property_readonly("names", [](const H& h) {
            std::vector<std::string> n;
            for (const auto& o : h->spec.options) n.push_back(o.name);
            return n;
        })
        .def_property_readonly("complete", [](const H& h) { return h->r.complete; })
        .def_property_readonly("pairs_total", [](const H& h) { return h->r.pairs_total; })
        .def_property_readonly("pairs_known", [](const H& h) { return h->r.pairs_known; })
        .def_property_readonly("distinct", [](const H& h) { return h->r.distinct; })
        .def_property_readonly("cycles_found", [](const H& h) { return h->r.cycles_found; })
        .def_property_readonly("cycles", [](const H& h) {
            py::list out;
            for (const auto& c : h->r.cycles) {
                py::dict d = span_dict(c);
                std::vector<std::string> names;
                for (auto i : c.options) names.push_back(h->spec.options[i].name);
                d["options"] = names;
                d["overshoot"] = std::string(to_string(h->spec.variants[c.variant].rule));
                d["order"] = std::string(to_string(h->spec.variants[c.variant].order));
                out.append(d);
            }
            return out;
        })
        .def("to_dict", [](const H& h) { return to_python(render::hunt_json(h->r, h->spec)); },
             "The document `overshoot hunt --json` prints, as dicts and lists.");

    m.def(
        "hunt",
        [](const py::args& families, const py::object& lengths, int step, const py::object& variants,
           int cycle_length, double min_strength, std::optional<std::string> require, long long list,
           const std::string& method, int threads, std::optional<std::string> checkpoint, bool resume,
           const py::object& progress) {
            if (threads < 0) throw InputError("threads must be 0 (all cores) or more");
            if (list < 1) throw InputError("list must be at least 1");
            auto h = std::make_shared<HuntOutcome>();
            HuntSpec& spec = h->spec;
            std::vector<std::string> texts;
            for (auto f : families) texts.push_back(f.cast<std::string>());
            std::atomic<bool> stop{false};
            std::atomic<std::size_t> done{0}, total{0};
            {
                py::gil_scoped_release unlocked;  // '@FILE' items are read here
                spec.options = parse_families(texts);
            }
            spec.grid = grid_of(lengths, step);
            spec.variants = variants_of(variants, Overshoot::stay, Order::simultaneous);
            spec.cycle_length = cycle_length;
            spec.min_strength = min_strength;
            if (require) {
                for (std::size_t i = 0; i < spec.options.size(); ++i)
                    if (spec.options[i].name == *require) spec.required = i;
                if (!spec.required) throw InputError(fmt::format("require '{}': no option of the family has that name", *require));
            }
            spec.max_listed = static_cast<std::size_t>(list);
            spec.engine.method = parse_length_method(method);
            spec.engine.threads = threads;
            spec.checkpoint = checkpoint.value_or("");
            spec.resume = resume;
            spec.cancel = &stop;
            spec.progress = [&](std::size_t d, std::size_t t) {
                done.store(d);
                total.store(t);
            };
            std::size_t reported = static_cast<std::size_t>(-1);
            auto poll = [&] {
                if (progress.is_none() || total.load() == 0 || done.load() == reported) return;
                reported = done.load();
                progress(reported, total.load());
            };
            try {
                run_interruptible([&] { h->r = run_hunt(spec); }, &stop, poll);
            } catch (py::error_already_set& e) {
                if (!e.matches(PyExc_KeyboardInterrupt) || h->r.complete) throw;
                // Stopped cleanly: the partial result rides on the exception.
                py::object interrupt = py::reinterpret_borrow<py::object>(PyExc_KeyboardInterrupt)(fmt::format(
                    "hunt interrupted: {} of {} pairs known{}", h->r.pairs_known, h->r.pairs_total,
                    spec.checkpoint.empty() ? "" : "; continue with resume=True"));
                interrupt.attr("result") = py::cast(h);
                PyErr_SetObject(PyExc_KeyboardInterrupt, interrupt.ptr());
                throw py::error_already_set();
            }
            spec.cancel = nullptr;  // the flag lives on this stack
            spec.progress = nullptr;
            poll();
            return h;
        },
        py::kw_only(), py::arg("lengths"), py::arg("step") = 1, py::arg("variants") = py::none(),
        py::arg("cycle_length") = 3, py::arg("min_strength") = 0.0, py::arg("require") = py::none(),
        py::arg("list") = 100, py::arg("method") = "auto", py::arg("threads") = 0,
        py::arg("checkpoint") = py::none(), py::arg("resume") = false, py::arg("progress") = py::none(),
        R"doc(hunt(*families, lengths, step=1, variants=None, cycle_length=3, min_strength=0, require=None, list=100, method="auto", threads=0, checkpoint=None, resume=False, progress=None) -> HuntResult

Over a family of options ("dice(count=1..3, sides=4,6,8)", docs/sweep.md), every length and rule
variant ((overshoot, order) pairs, simultaneous or coin), the intransitive sets
of cycle_length options, ranked by strength, as `overshoot hunt --json`.
progress(done, total) is called about ten times a second while cells are
computed. Ctrl-C stops the hunt cleanly: the checkpoint (if any) is written and
KeyboardInterrupt is raised, with the partial result as its `result`; run again
with resume=True to continue.)doc");
}

}  // namespace

void bind_sweeps(py::module_& m) {
    bind_sweep(m);
    bind_hunt(m);
}

}  // namespace overshoot::python
