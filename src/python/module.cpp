// The Python module overshoot._core: errors, options, boards and the helpers
// of common.hpp; each analysis is bound in a file of its own.
#include <fmt/format.h>

#include <chrono>
#include <exception>
#include <future>
#include <thread>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/scenario.hpp"
#include "python/common.hpp"

namespace overshoot::python {

namespace {

std::string jump_word(const py::handle& j) {
    if (py::isinstance<py::str>(j)) return j.cast<std::string>();
    auto t = j.cast<std::pair<int, int>>();  // TypeError for anything else
    return fmt::format("{}:{}", t.first, t.second);
}

}  // namespace

Setup make_setup(const py::tuple& options, const BoardArgs& b, std::size_t min_options, std::size_t max_options) {
    SetupRequest r;
    r.length = b.length;
    r.overshoot = b.overshoot;
    r.order = b.order;
    r.scenario = b.scenario;
    if (!b.jumps.is_none()) {
        r.jumps.emplace();
        for (auto j : b.jumps) r.jumps->push_back(jump_word(j));
    }
    if (!b.board.is_none()) {
        if (b.length || b.overshoot || !b.jumps.is_none())
            throw InputError("give either board= or length=, overshoot= and jumps=, not both");
        const auto& board = b.board.cast<const Board&>();
        r.length = board.length;
        r.overshoot = std::string(to_string(board.rule));
        r.jumps.emplace();
        for (const auto& j : board.jumps) r.jumps->push_back(fmt::format("{}:{}", j.from, j.to));
    }
    // Option objects keep their own name: resolve their spec, then put them back.
    std::vector<std::pair<std::size_t, Option>> given;
    for (std::size_t i = 0; i < options.size(); ++i) {
        py::handle o = options[i];
        if (py::isinstance<Option>(o)) {
            given.emplace_back(i, o.cast<Option>());
            r.words.push_back(given.back().second.spec);
        } else if (py::isinstance<py::str>(o)) {
            r.words.push_back(o.cast<std::string>());
        } else {
            throw py::type_error("options are spec strings, scenario names or overshoot.Option objects");
        }
    }
    r.min_options = min_options;
    r.max_options = max_options;
    Setup s;
    {
        py::gil_scoped_release unlocked;  // a scenario file is read here
        s = resolve_setup(r);
    }
    for (auto& [i, o] : given) s.options[i] = std::move(o);
    return s;
}

py::object fraction(const mpq_class& q) {
    py::object Fraction = py::module_::import("fractions").attr("Fraction");
    auto integer = [](const mpz_class& z) {
        return py::reinterpret_steal<py::object>(PyLong_FromString(z.get_str().c_str(), nullptr, 10));
    };
    return Fraction(integer(q.get_num()), integer(q.get_den()));
}

py::object to_python(const nlohmann::json& j) {
    return py::module_::import("json").attr("loads")(j.dump());
}

void run_interruptible(const std::function<void()>& work, std::atomic<bool>* stop, const std::function<void()>& poll) {
    std::promise<void> done;
    std::future<void> finished = done.get_future();
    std::thread worker([&] {
        try {
            work();
            done.set_value();
        } catch (...) {
            done.set_exception(std::current_exception());
        }
    });
    std::optional<py::error_already_set> raised;  // Ctrl-C, or an error in `poll`
    for (;;) {
        bool ready;
        {
            py::gil_scoped_release unlocked;
            ready = finished.wait_for(std::chrono::milliseconds(100)) == std::future_status::ready;
        }
        if (ready) break;
        if (raised) continue;  // stopping: wait for the work to notice
        try {
            if (PyErr_CheckSignals() != 0) throw py::error_already_set();
            if (poll) poll();
        } catch (py::error_already_set& e) {
            raised = std::move(e);
            if (stop) stop->store(true);
        }
    }
    worker.join();
    if (raised) {
        if (poll) {
            try {
                poll();  // the last progress report
            } catch (py::error_already_set&) {
            }
        }
        throw *raised;
    }
    finished.get();  // rethrows the work's exception
}

void bind_options(py::module_& m) {
    py::class_<Option>(m, "Option", R"doc(A movement option: the exact distribution of squares moved per turn.

Option(spec, name=None) parses the spec grammar of docs/options.md, e.g. "2d6",
"[1,2,6]", "{1:2,3:1}", "1d4+1d6". Raises ValueError naming the problem.)doc")
        .def(py::init([](const std::string& spec, std::optional<std::string> name) {
                 return name ? parse_option(spec, *name) : parse_option(spec);
             }),
             py::arg("spec"), py::arg("name") = py::none())
        .def_readonly("name", &Option::name, "name shown in results (the spec unless given)")
        .def_readonly("spec", &Option::spec, "the spec as typed")
        .def_readonly("denominator", &Option::denominator, "common denominator of the weights")
        .def_property_readonly("weights", [](const Option& o) { return o.weight; },
                               "weights[m] = ways to move m squares (over denominator)")
        .def_property_readonly("min_move", &Option::min_move)
        .def_property_readonly("max_move", &Option::max_move)
        .def_property_readonly("mean", &Option::mean, "mean squares moved per turn")
        .def(
            "probability",
            [](const Option& o, int move) {
                mpq_class q(0);
                if (move >= 0 && move <= o.max_move())
                    q = mpq_class(mpz_class(std::to_string(o.weight[static_cast<std::size_t>(move)])),
                                  mpz_class(std::to_string(o.denominator)));
                q.canonicalize();
                return fraction(q);
            },
            py::arg("move"), "P(moving exactly `move` squares in one turn), exactly, as fractions.Fraction")
        .def("__repr__", [](const Option& o) {
            return o.name == o.spec ? fmt::format("Option('{}')", o.spec)
                                    : fmt::format("Option('{}', name='{}')", o.spec, o.name);
        });

    py::class_<Board>(m, "Board", R"doc(A board: squares 0..length, the overshoot rule and the jumps.

Board(length, overshoot="stay", jumps=()) validates as the command line does;
jumps are "FROM:TO" strings or (from, to) pairs. Pass it as board=... to any
analysis instead of length=, overshoot= and jumps=.)doc")
        .def(py::init([](int length, const std::string& rule, const py::object& jumps) {
                 std::vector<Jump> js;
                 for (auto j : jumps) js.push_back(parse_jump(jump_word(j)));
                 return make_board(length, parse_overshoot(rule), std::move(js));
             }),
             py::arg("length"), py::arg("overshoot") = "stay", py::arg("jumps") = py::tuple())
        .def_readonly("length", &Board::length)
        .def_property_readonly("overshoot", [](const Board& b) { return std::string(to_string(b.rule)); })
        .def_property_readonly("jumps",
                               [](const Board& b) {
                                   std::vector<std::pair<int, int>> js;
                                   for (const auto& j : b.jumps) js.emplace_back(j.from, j.to);
                                   return js;
                               })
        .def("__repr__", [](const Board& b) {
            std::string js;
            for (const auto& j : b.jumps) js += fmt::format("{}'{}:{}'", js.empty() ? "" : ", ", j.from, j.to);
            return fmt::format("Board({}, overshoot='{}', jumps=[{}])", b.length, to_string(b.rule), js);
        });

    py::class_<Setup>(m, "Setup", "A board, a turn order and options, resolved as every analysis resolves them.")
        .def_readonly("board", &Setup::board)
        .def_property_readonly("order", [](const Setup& s) { return std::string(to_string(s.order)); })
        .def_readonly("options", &Setup::options);
    m.def(
        "setup",
        [](const py::args& options, std::optional<int> length, std::optional<std::string> overshoot,
           py::object jumps, std::optional<std::string> order, std::optional<std::string> scenario,
           py::object board) {
            return make_setup(options, {length, overshoot, jumps, order, scenario, board}, 0, 100'000);
        },
        OVERSHOOT_BOARD_KWARGS,
        R"doc(setup(*options, length=None, overshoot=None, jumps=None, order=None, scenario=None, board=None)

The board, order and options an analysis would use: options are spec strings,
names of the scenario's options or Option objects; with none, the scenario's.)doc");

    m.def(
        "set_memory_limit",
        [](long long mib) {
            if (mib < 1 || mib > limits::max_memory_mib)
                throw InputError(fmt::format("memory limit {}: expected 1..{} MiB", mib, limits::max_memory_mib));
            limits::set_memory_bytes(static_cast<std::uint64_t>(mib) << 20);
        },
        py::arg("mib"), "Caps the memory one computation may plan to use (MiB; default 4096), as --memory-limit.");
    m.def("memory_limit", [] { return limits::memory_bytes() >> 20; }, "The memory cap in force, in MiB.");
}

}  // namespace overshoot::python

PYBIND11_MODULE(_core, m) {
    using namespace overshoot;
    namespace py = pybind11;
    m.doc() = "overshoot: exact analysis of race games where the finish must be hit exactly (docs/python.md).";
    m.attr("__version__") = OVERSHOOT_VERSION;
    // Bad input is a ValueError with the command line's one-line message; a
    // resource limit is a LimitError, a ValueError of its own type.
    static py::exception<LimitError> limit_error(m, "LimitError", PyExc_ValueError);
    py::register_exception_translator([](std::exception_ptr p) {
        try {
            if (p) std::rethrow_exception(p);
        } catch (const LimitError& e) {
            PyErr_SetString(limit_error.ptr(), e.what());
        } catch (const InputError& e) {
            PyErr_SetString(PyExc_ValueError, e.what());
        } catch (const InternalError& e) {
            PyErr_SetString(PyExc_RuntimeError, (std::string("internal error: ") + e.what()).c_str());
        }
    });
    python::bind_options(m);
    python::bind_duels(m);
    python::bind_races(m);
    python::bind_sweeps(m);
}
