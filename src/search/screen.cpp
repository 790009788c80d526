#include "search/screen.hpp"

#include <algorithm>
#include <cmath>

#include "chain/series.hpp"

namespace overshoot {

namespace {

constexpr double kAliveTarget = 1e-11;  // stop once this little mass may still finish
constexpr double kSettled = 1e-10;      // rates equal to this from turn to turn: geometric from here
constexpr int kSettledTurns = 6;        // ... for this many turns in a row
constexpr std::uint64_t kWork = 60'000'000;  // transitions one option may take

}  // namespace

ScreenTrack screen_track(const Chain& chain) {
    ScreenTrack tr;
    FastSeries s(chain);
    tr.f.push_back(0);
    tr.surv.push_back(1);
    double prev_alive = static_cast<double>(s.alive()), prev_stuck = static_cast<double>(s.stuck());
    double lam0 = -1, phi0 = -1, sig0 = -1;
    int settled = 0;
    while (prev_alive >= kAliveTarget && s.work() < kWork) {
        const double f = static_cast<double>(s.step());
        const double alive = static_cast<double>(s.alive()), stuck = static_cast<double>(s.stuck());
        tr.f.push_back(f);
        tr.surv.push_back(alive + stuck);
        const double phi = f / prev_alive, sig = (stuck - prev_stuck) / prev_alive, lam = alive / prev_alive;
        tr.phi = phi;
        tr.sigma = sig;
        tr.lambda = lam;
        // Settled: the live mass decays geometrically with fixed shares finishing and sticking.
        if (phi + sig > 1e-12 && std::fabs(lam - lam0) <= kSettled && std::fabs(phi - phi0) <= kSettled &&
            std::fabs(sig - sig0) <= kSettled)
            ++settled;
        else
            settled = 0;
        lam0 = lam;
        phi0 = phi;
        sig0 = sig;
        prev_alive = alive;
        prev_stuck = stuck;
        if (settled >= kSettledTurns) break;
    }
    tr.alive_end = prev_alive;
    tr.stuck_end = prev_stuck;
    if (!(tr.lambda < 1)) tr.lambda = 1;
    return tr;
}

namespace {

struct Wins {
    double simultaneous = 0;  // sum_t f_A(t) S_B(t): A finishes before B (or B never does)
    double a_first = 0;       // sum_t f_A(t) S_B(t-1): A finishes no later than B
};

// The state of a track at turn t (t >= its end): live and stuck mass.
std::pair<double, double> state_at(const ScreenTrack& x, int t) {
    const int T = static_cast<int>(x.f.size()) - 1;
    double alive = x.alive_end, stuck = x.stuck_end;
    for (int k = T; k < t; ++k) {
        stuck += x.sigma * alive;
        alive *= x.lambda;
    }
    return {alive, stuck};
}

Wins wins(const ScreenTrack& a, const ScreenTrack& b) {
    const int Ta = static_cast<int>(a.f.size()) - 1, Tb = static_cast<int>(b.f.size()) - 1;
    const int T = std::max(Ta, Tb);
    Wins w;
    // Past its end each track continues geometrically.
    double alive_a = a.alive_end, alive_b = b.alive_end, stuck_b = b.stuck_end;
    double sb_prev = 1;
    for (int t = 1; t <= T; ++t) {
        double fa;
        if (t <= Ta)
            fa = a.f[t];
        else {
            fa = a.phi * alive_a;
            alive_a *= a.lambda;
        }
        double sb;
        if (t <= Tb)
            sb = b.surv[t];
        else {
            stuck_b += b.sigma * alive_b;
            alive_b *= b.lambda;
            sb = alive_b + stuck_b;
        }
        w.simultaneous += fa * sb;
        w.a_first += fa * sb_prev;
        sb_prev = sb;
    }
    // After turn T, in closed form: f_A(T+k) = phi_A a_A lambda_A^(k-1),
    // S_B(T+k) = C_B + D_B lambda_B^k.
    const auto [aa, sa] = state_at(a, T);
    const auto [ab, sb] = state_at(b, T);
    (void)sa;
    if (aa > 0 && a.lambda < 1) {
        const double decay_b = 1 - b.lambda;
        const double C = decay_b > 0 ? sb + ab * b.sigma / decay_b : sb + ab;
        const double D = decay_b > 0 ? ab - ab * b.sigma / decay_b : 0;
        const double head = a.phi * aa;
        w.simultaneous += head * (C / (1 - a.lambda) + D * b.lambda / (1 - a.lambda * b.lambda));
        w.a_first += head * (C / (1 - a.lambda) + D / (1 - a.lambda * b.lambda));
    }
    return w;
}

}  // namespace

double screen_margin(const ScreenTrack& a, const ScreenTrack& b, Order order) {
    const Wins ab = wins(a, b), ba = wins(b, a);
    if (order == Order::coin)
        return 0.5 * (ab.a_first + ab.simultaneous) - 0.5 * (ba.a_first + ba.simultaneous);
    return ab.simultaneous - ba.simultaneous;
}

}  // namespace overshoot
