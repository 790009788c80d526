#include "hunt/mpi/ranks.hpp"

#include <mpi.h>
#include <fmt/format.h>

#include <nlohmann/json.hpp>

#include <algorithm>
#include <chrono>
#include <cstdint>
#include <cstdlib>
#include <thread>

#include "core/error.hpp"
#include "core/parallel.hpp"
#include "hunt/checkpoint.hpp"

namespace overshoot::cluster {

namespace {

constexpr int tag_header = 1, tag_data = 2;
constexpr std::size_t chunk = std::size_t{1} << 28;  // MPI counts are int: send in 256 MiB pieces

int env_int(const char* name, int fallback) {
    const char* v = std::getenv(name);
    if (!v || !*v) return fallback;
    char* end = nullptr;
    const long x = std::strtol(v, &end, 10);
    return (*end == 0 && x > 0 && x < 1000000) ? static_cast<int>(x) : fallback;
}

void broadcast(std::string& bytes) {
    unsigned long long size = bytes.size();
    MPI_Bcast(&size, 1, MPI_UNSIGNED_LONG_LONG, 0, MPI_COMM_WORLD);
    bytes.resize(size);
    for (std::size_t at = 0; at < size; at += chunk) {
        const int n = static_cast<int>(std::min<std::size_t>(chunk, size - at));
        MPI_Bcast(bytes.data() + at, n, MPI_CHAR, 0, MPI_COMM_WORLD);
    }
}

nlohmann::json plan_json(const HuntPlan& p) {
    nlohmann::json shards = nlohmann::json::array();
    for (const auto& s : p.shards) {
        std::vector<std::size_t> pairs;
        for (const auto& q : s.pairs) {
            pairs.push_back(q.a);
            pairs.push_back(q.b);
        }
        shards.push_back({s.id, s.variant, static_cast<int>(s.method), pairs, s.first, s.count, s.cost, s.rank});
    }
    return {{"ranks", p.ranks},
            {"rank_cost", p.rank_cost},
            {"pairs_total", p.pairs_total},
            {"pairs_known", p.pairs_known},
            {"shards", shards}};
}

HuntPlan plan_from_json(const nlohmann::json& j) {
    HuntPlan p;
    p.ranks = j.at("ranks").get<int>();
    p.rank_cost = j.at("rank_cost").get<std::vector<double>>();
    p.pairs_total = j.at("pairs_total").get<std::size_t>();
    p.pairs_known = j.at("pairs_known").get<std::size_t>();
    for (const auto& s : j.at("shards")) {
        HuntShard h;
        h.id = s.at(0).get<std::size_t>();
        h.variant = s.at(1).get<std::size_t>();
        h.method = static_cast<LengthMethod>(s.at(2).get<int>());
        const auto pairs = s.at(3).get<std::vector<std::size_t>>();
        for (std::size_t i = 0; i + 1 < pairs.size(); i += 2) h.pairs.push_back({pairs[i], pairs[i + 1]});
        h.first = s.at(4).get<std::size_t>();
        h.count = s.at(5).get<std::size_t>();
        h.cost = s.at(6).get<double>();
        h.rank = s.at(7).get<int>();
        p.shards.push_back(std::move(h));
    }
    return p;
}

// Shards with a cell that no checkpoint on disk (nor `mine`) holds.
std::vector<std::size_t> unfinished_shards(const HuntSpec& spec, const HuntPlan& plan, const HuntStore& mine,
                                           std::size_t& pairs_saved) {
    HuntStore disk = mine;
    if (!spec.checkpoint.empty()) {
        HuntSpec s = spec;
        s.resume = true;
        try {
            disk.merge(load_hunt_store(s).checkpoint(0), spec.checkpoint);
        } catch (const InputError&) {
            // Nothing readable on disk: only this rank's own work counts.
        }
    }
    pairs_saved = disk.pairs_known();
    std::vector<std::size_t> out;
    for (const auto& sh : plan.shards) {
        bool done = true;
        for (const auto& p : sh.pairs)
            for (std::size_t k = sh.first; done && k < sh.first + sh.count; ++k)
                if (!disk.known(sh.variant, p.a, p.b, k)) done = false;
        if (!done) out.push_back(sh.id);
    }
    return out;
}

}  // namespace

bool launched_by_mpirun() {
    return std::getenv("OMPI_COMM_WORLD_SIZE") != nullptr || std::getenv("PMIX_RANK") != nullptr ||
           std::getenv("PMI_RANK") != nullptr;
}

void settle_before_exit() {
    int started = 0, ended = 0;
    MPI_Initialized(&started);
    MPI_Finalized(&ended);
    if (started || ended) return;
    MPI_Init(nullptr, nullptr);
    MPI_Barrier(MPI_COMM_WORLD);
    MPI_Finalize();
}

Ranks::Ranks() {
    int provided = 0;
    MPI_Init_thread(nullptr, nullptr, MPI_THREAD_FUNNELED, &provided);
    MPI_Comm_rank(MPI_COMM_WORLD, &rank_);
    MPI_Comm_size(MPI_COMM_WORLD, &size_);
    local_size_ = env_int("OMPI_COMM_WORLD_LOCAL_SIZE", 1);
}

Ranks::~Ranks() { MPI_Finalize(); }

void Ranks::abort(int status) {
    MPI_Abort(MPI_COMM_WORLD, status);
    std::_Exit(status);
}

void Ranks::leave(int status) { std::_Exit(status); }

RanksOutcome run_hunt_ranks(const HuntSpec& spec, Ranks& ranks, const std::atomic<bool>& signalled) {
    validate_hunt(spec);  // the same verdict on every rank: no message crosses yet
    RanksOutcome out;
    out.root = ranks.rank() == 0;
    out.threads = spec.engine.threads > 0 ? spec.engine.threads : threads_per_process(ranks.local_size());
    HuntSpec local = spec;
    local.engine.threads = out.threads;
    const std::uint64_t fp = hunt_fingerprint(spec);

    // Rank 0 reads the checkpoints and plans; everyone gets the plan (or the error).
    HuntStore store;
    std::string message;
    if (out.root) {
        try {
            store = load_hunt_store(spec);
            if (!spec.resume) remove_rank_checkpoint_files(spec.checkpoint);
            out.plan = plan_hunt(local, store, ranks.size(), out.threads);
            const auto cbor = nlohmann::json::to_cbor(plan_json(out.plan));
            message = "P" + std::string(cbor.begin(), cbor.end());
        } catch (const InputError& e) {
            message = std::string("E") + e.what();
        }
    }
    broadcast(message);
    if (message.empty()) throw InternalError("hunt ranks: empty plan message");
    if (message[0] == 'E') throw InputError(message.substr(1));
    if (!out.root) {
        const std::vector<std::uint8_t> cbor(message.begin() + 1, message.end());
        out.plan = plan_from_json(nlohmann::json::from_cbor(cbor));
    }
    if (out.root && spec.on_plan) spec.on_plan(out.plan);

    // This rank's shards, into its own store and its own checkpoint file.
    HuntStore fresh(spec.options.size(), spec.variants.size(), spec.grid.lengths().size());
    std::function<void(const HuntStore&)> save;
    const std::string mine = spec.checkpoint.empty() ? std::string() : rank_checkpoint_file(spec.checkpoint, ranks.rank());
    if (!mine.empty()) save = [&](const HuntStore& s) { save_checkpoint(mine, s.checkpoint(fp)); };
    const auto t0 = std::chrono::steady_clock::now();
    try {
        compute_shards(local, out.plan, ranks.rank(), fresh, save);
    } catch (const InputError& e) {
        throw RankError{2, e.what()};
    } catch (const std::bad_alloc&) {
        throw RankError{2, "out of memory (lower the input size or --memory-limit)"};
    } catch (const std::exception& e) {
        throw RankError{3, e.what()};
    }
    const double busy = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    std::size_t my_shards = 0;
    for (const auto& sh : out.plan.shards)
        if (sh.rank == ranks.rank()) ++my_shards;

    auto stop_here = [&] {
        out.signalled = true;
        if (out.root) out.unfinished = unfinished_shards(spec, out.plan, fresh, out.pairs_saved);
        return out;
    };
    if (signalled.load()) return stop_here();

    if (!out.root) {
        // Header: payload size, busy seconds, shard count; then the payload.
        const std::string payload = encode_checkpoint(fresh.checkpoint(fp));
        double header[3] = {static_cast<double>(payload.size()), busy, static_cast<double>(my_shards)};
        MPI_Send(header, 3, MPI_DOUBLE, 0, tag_header, MPI_COMM_WORLD);
        for (std::size_t at = 0; at < payload.size(); at += chunk) {
            const int n = static_cast<int>(std::min<std::size_t>(chunk, payload.size() - at));
            MPI_Send(payload.data() + at, n, MPI_CHAR, 0, tag_data, MPI_COMM_WORLD);
        }
        return out;
    }

    // Rank 0: gather every other rank's cells, watching for a signal while waiting.
    out.busy_seconds.assign(ranks.size(), 0);
    out.shard_count.assign(ranks.size(), 0);
    out.busy_seconds[0] = busy;
    out.shard_count[0] = my_shards;
    store.merge(fresh.checkpoint(fp), "rank 0");
    for (int got = 1; got < ranks.size(); ++got) {
        MPI_Status st;
        int ready = 0;
        while (true) {
            MPI_Iprobe(MPI_ANY_SOURCE, tag_header, MPI_COMM_WORLD, &ready, &st);
            if (ready) break;
            if (signalled.load()) return stop_here();
            std::this_thread::sleep_for(std::chrono::milliseconds(5));
        }
        const int from = st.MPI_SOURCE;
        double header[3];
        MPI_Recv(header, 3, MPI_DOUBLE, from, tag_header, MPI_COMM_WORLD, MPI_STATUS_IGNORE);
        std::string payload(static_cast<std::size_t>(header[0]), '\0');
        for (std::size_t at = 0; at < payload.size(); at += chunk) {
            const int n = static_cast<int>(std::min<std::size_t>(chunk, payload.size() - at));
            MPI_Recv(payload.data() + at, n, MPI_CHAR, from, tag_data, MPI_COMM_WORLD, MPI_STATUS_IGNORE);
        }
        const std::string where = fmt::format("the results of rank {}", from);
        const Checkpoint c = decode_checkpoint(payload, where);
        if (c.fingerprint != fp) throw InternalError(where + " belong to a different hunt");
        store.merge(c, where);
        out.busy_seconds[from] = header[1];
        out.shard_count[from] = static_cast<std::size_t>(header[2]);
    }
    if (!spec.checkpoint.empty()) {
        save_checkpoint(spec.checkpoint, store.checkpoint(fp));
        // The merged checkpoint holds what the rank files held.
        remove_rank_checkpoint_files(spec.checkpoint);
    }
    out.result = search_cycles(spec, store);
    return out;
}

}  // namespace overshoot::cluster
