// duel_margin A B LENGTH: how much more often option A finishes first than
// option B on a board of LENGTH squares, with its proven bound, through the
// installed library (no command line involved).
#include <overshoot/overshoot.hpp>

#include <cstdio>
#include <string>

int main(int argc, char** argv) {
    if (argc != 4) {
        std::fprintf(stderr, "usage: duel_margin A B LENGTH\n");
        return 2;
    }
    try {
        overshoot::SetupRequest request;
        request.words = {argv[1], argv[2]};
        request.min_options = request.max_options = 2;
        request.length = std::stoi(argv[3]);
        const overshoot::Setup s = overshoot::resolve_setup(request);
        const overshoot::Chain a = overshoot::build_chain(s.board, s.options[0]);
        const overshoot::Chain b = overshoot::build_chain(s.board, s.options[1]);
        const overshoot::DuelResult r = overshoot::duel(a, b, s.order);
        std::printf("%s against %s on %d squares: margin %.12f, bound %.3g, %s\n", s.options[0].name.c_str(),
                    s.options[1].name.c_str(), s.board.length, r.margin(), r.error_bound(),
                    r.a_beats_b() ? "A beats B" : r.b_beats_a() ? "B beats A" : "undecided");
    } catch (const overshoot::InputError& e) {
        std::fprintf(stderr, "duel_margin: %s\n", e.what());
        return 2;
    } catch (const std::exception& e) {
        std::fprintf(stderr, "duel_margin: %s\n", e.what());
        return 3;
    }
    return 0;
}
