#pragma once
// A hunt run as MPI ranks (`mpirun -np N overshoot hunt ...`). Rank 0 loads
// the checkpoints, plans the shards (hunt/plan.hpp) and sends the plan to
// every rank; each rank computes its own shards with all its threads and
// keeps them in its own checkpoint file (FILE.rank<r>); rank 0 gathers the
// results, saves the merged checkpoint and searches the cycles. The output is
// byte-identical to a one-process run: every cell is computed by one rank by
// the same code, and a pair's numbers do not depend on the pairs beside it.
// Only MPI calls cross between processes. Built only when CMake finds MPI.
#include <atomic>
#include <cstddef>
#include <string>
#include <vector>

#include "hunt/hunt.hpp"

namespace overshoot::cluster {

// True when this process was started by mpirun (its environment says so).
bool launched_by_mpirun();

// Bad input that every rank meets before MPI starts (an argument, a family):
// rank 0 says so, and this holds every rank at a barrier until it has, since
// mpirun ends the whole job when the first rank exits. Nothing when MPI has
// already started or ended.
void settle_before_exit();

// MPI for the lifetime of the object.
class Ranks {
public:
    Ranks();
    ~Ranks();
    Ranks(const Ranks&) = delete;
    Ranks& operator=(const Ranks&) = delete;
    int rank() const { return rank_; }
    int size() const { return size_; }
    int local_size() const { return local_size_; }  // ranks on this machine
    // Ends the whole job now (MPI_Abort) with `status`.
    [[noreturn]] void abort(int status);
    // Leaves without MPI_Finalize: the job is already being torn down.
    [[noreturn]] static void leave(int status);

private:
    int rank_ = 0, size_ = 1, local_size_ = 1;
};

// An error while one rank computed its shards: the job must end.
struct RankError {
    int status = 2;  // 2: input or limit, 3: internal
    std::string message;
};

struct RanksOutcome {
    bool root = false;        // rank 0: holds the result, the report and the plan
    bool signalled = false;   // stopped by a signal: the checkpoints hold the finished work
    HuntPlan plan;
    HuntResult result;
    int threads = 1;                       // per rank
    std::vector<double> busy_seconds;      // per rank: time spent computing its shards
    std::vector<std::size_t> shard_count;  // per rank
    std::vector<std::size_t> unfinished;   // shard ids, when signalled (rank 0)
    std::size_t pairs_saved = 0;           // pairs whole in the checkpoints, when signalled
};

// Every rank calls this with the same spec. `signalled` is set by the
// caller's SIGTERM/SIGINT handler; spec.cancel must point to a flag that it
// also sets. Throws InputError (the same on every rank) for bad input, and
// RankError when this rank failed while computing.
RanksOutcome run_hunt_ranks(const HuntSpec& spec, Ranks& ranks, const std::atomic<bool>& signalled);

}  // namespace overshoot::cluster
