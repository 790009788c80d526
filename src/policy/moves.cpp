#include "policy/moves.hpp"

namespace overshoot {

namespace {
template <class T>
T ratio(std::uint64_t num, std::uint64_t den);

template <>
long double ratio<long double>(std::uint64_t num, std::uint64_t den) {
    return static_cast<long double>(num) / static_cast<long double>(den);
}

template <>
mpq_class ratio<mpq_class>(std::uint64_t num, std::uint64_t den) {
    mpq_class q(mpz_class(static_cast<unsigned long>(num)), mpz_class(static_cast<unsigned long>(den)));
    q.canonicalize();
    return q;
}
}  // namespace

template <class T>
Moves<T> make_moves(const Chain& c) {
    Moves<T> m;
    const int n = c.length;
    m.length = n;
    m.start.assign(static_cast<std::size_t>(n) + 1, 0);
    for (int s = 0; s < n; ++s) {
        m.start[s] = static_cast<std::int64_t>(m.dest.size());
        for (auto k = c.row_start[s]; k < c.row_start[s + 1]; ++k) {
            if (c.dest[k] == s) continue;
            m.dest.push_back(c.dest[k]);
            m.p.push_back(ratio<T>(c.weight[k], c.denominator));
        }
        m.stay.push_back(ratio<T>(c.stay_weight[s], c.denominator));
        m.leave.push_back(ratio<T>(c.denominator - c.stay_weight[s], c.denominator));
        m.finish.push_back(ratio<T>(c.finish_weight[s], c.denominator));
        m.unfinished.push_back(ratio<T>(c.denominator - c.finish_weight[s], c.denominator));
    }
    m.start[n] = static_cast<std::int64_t>(m.dest.size());
    m.resting = c.resting;
    return m;
}

template Moves<long double> make_moves<long double>(const Chain&);
template Moves<mpq_class> make_moves<mpq_class>(const Chain&);

}  // namespace overshoot
