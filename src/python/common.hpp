#pragma once
// Helpers shared by the Python bindings: turning Python arguments into the
// library's inputs (the same spec strings, scenario files and board words as
// the command line), and the library's results into Python values.
#include <pybind11/numpy.h>
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include <gmpxx.h>
#include <nlohmann/json.hpp>

#include <atomic>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "core/setup.hpp"

namespace overshoot::python {

namespace py = pybind11;

// The board keywords every analysis takes: length, overshoot, jumps, order,
// scenario, or a Board object (board=...), which replaces the first three.
struct BoardArgs {
    std::optional<int> length;
    std::optional<std::string> overshoot;
    py::object jumps;  // None, or "FROM:TO" strings / (from, to) pairs
    std::optional<std::string> order;
    std::optional<std::string> scenario;
    py::object board;  // None or a Board
};

// Declares the board keywords after the ones already given to `f`.
#define OVERSHOOT_BOARD_KWARGS                                                                      \
    py::arg("length") = py::none(), py::arg("overshoot") = py::none(), py::arg("jumps") = py::none(), \
        py::arg("order") = py::none(), py::arg("scenario") = py::none(), py::arg("board") = py::none()

// Options given as spec strings, scenario names or Option objects, merged with
// the scenario and keywords as the command line merges its flags. Needs the GIL.
Setup make_setup(const py::tuple& options, const BoardArgs& b, std::size_t min_options, std::size_t max_options);

// A reduced GMP fraction as fractions.Fraction. Needs the GIL.
py::object fraction(const mpq_class& q);

// A JSON document (rendered by src/render) as Python dicts and lists: the CLI's
// --json output parsed by json.loads. Needs the GIL.
py::object to_python(const nlohmann::json& j);

// A copy of `v` as a 1-D or (rows x cols) NumPy array. Needs the GIL.
template <class T, class U = T>
py::array_t<T> array(const std::vector<U>& v) {
    py::array_t<T> a(static_cast<py::ssize_t>(v.size()));
    T* out = a.mutable_data();
    for (std::size_t i = 0; i < v.size(); ++i) out[i] = static_cast<T>(v[i]);
    return a;
}
template <class T, class U = T>
py::array_t<T> matrix(const std::vector<U>& v, std::size_t rows, std::size_t cols) {
    py::array_t<T> a({static_cast<py::ssize_t>(rows), static_cast<py::ssize_t>(cols)});
    T* out = a.mutable_data();
    for (std::size_t i = 0; i < rows * cols; ++i) out[i] = static_cast<T>(v[i]);
    return a;
}

// Runs `work` without the GIL on a thread of its own while this thread looks
// for Ctrl-C (and calls `poll`, with the GIL, e.g. to report progress) every
// tenth of a second. On Ctrl-C it sets `*stop`, waits for `work` to return,
// then raises KeyboardInterrupt. Exceptions of `work` propagate.
void run_interruptible(const std::function<void()>& work, std::atomic<bool>* stop,
                       const std::function<void()>& poll = {});

void bind_options(py::module_& m);
void bind_duels(py::module_& m);
void bind_races(py::module_& m);   // race, certify, check
void bind_sweeps(py::module_& m);  // sweep, hunt

}  // namespace overshoot::python
