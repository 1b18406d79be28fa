#include "analysis/sweep_runner.hpp"
#include "core/stopwatch.hpp"

#include <chrono>
#include <cstring>
#include <limits>
#include <stdexcept>

namespace colchem {

namespace {

// Outcomes travel to rank 0 as one byte buffer per rank.
class Packer {
 public:
  template <typename T>
  void put(const T& v) {
    // resize + memcpy (not insert): GCC 12 warns falsely of an overflow on a one-byte insert
    // followed by an eight-byte one.
    const std::size_t at = buf_.size();
    buf_.resize(at + sizeof(T));
    std::memcpy(buf_.data() + at, &v, sizeof(T));
  }
  void put_doubles(const std::vector<double>& v) {
    put<std::uint64_t>(v.size());
    const auto* p = reinterpret_cast<const char*>(v.data());
    buf_.insert(buf_.end(), p, p + v.size() * sizeof(double));
  }
  void put_string(const std::string& s) {
    put<std::uint64_t>(s.size());
    buf_.insert(buf_.end(), s.begin(), s.end());
  }
  std::vector<char>& bytes() { return buf_; }

 private:
  std::vector<char> buf_;
};

class Unpacker {
 public:
  Unpacker(const char* p, std::size_t n) : p_(p), end_(p + n) {}
  template <typename T>
  T get() {
    need(sizeof(T));
    T v;
    std::memcpy(&v, p_, sizeof(T));
    p_ += sizeof(T);
    return v;
  }
  std::vector<double> get_doubles() {
    const auto n = get<std::uint64_t>();
    need(n * sizeof(double));
    std::vector<double> v(n);
    // An empty vector's data() may be null, and memcpy from or to null is undefined even
    // for zero bytes (UBSan: nonnull-attribute).
    if (n > 0) std::memcpy(v.data(), p_, n * sizeof(double));
    p_ += n * sizeof(double);
    return v;
  }
  std::string get_string() {
    const auto n = get<std::uint64_t>();
    need(n);
    std::string s(p_, n);
    p_ += n;
    return s;
  }
  [[nodiscard]] bool done() const { return p_ == end_; }

 private:
  void need(std::size_t n) const {
    if (static_cast<std::size_t>(end_ - p_) < n)
      throw std::runtime_error("sweep: truncated result buffer");
  }
  const char* p_;
  const char* end_;
};

void pack(Packer& pk, const VariantOutcome& o) {
  pk.put<std::uint64_t>(o.index);
  pk.put<std::uint8_t>(o.converged ? 1 : 0);
  pk.put<std::uint8_t>(o.interrupted ? 1 : 0);
  pk.put<std::uint8_t>(o.warm_started ? 1 : 0);
  pk.put<std::int32_t>(o.iterations);
  pk.put<std::int32_t>(o.rank);
  pk.put<double>(o.residual);
  pk.put<double>(o.wall_seconds);
  pk.put_string(o.reason);
  pk.put_doubles(o.values);
}

VariantOutcome unpack(Unpacker& up) {
  VariantOutcome o;
  o.index = up.get<std::uint64_t>();
  o.converged = up.get<std::uint8_t>() != 0;
  o.interrupted = up.get<std::uint8_t>() != 0;
  o.warm_started = up.get<std::uint8_t>() != 0;
  o.iterations = up.get<std::int32_t>();
  o.rank = up.get<std::int32_t>();
  o.residual = up.get<double>();
  o.wall_seconds = up.get<double>();
  o.reason = up.get_string();
  o.values = up.get_doubles();
  return o;
}

/// One variant on this rank, timed; a runner that throws gives a failed outcome.
VariantOutcome run_one(const Variant& v, const VariantRunner& run, int rank) {
  const auto t0 = std::chrono::steady_clock::now();
  VariantOutcome out;
  try {
    out = run(v);
  } catch (const std::exception& e) {
    out = VariantOutcome{};
    out.converged = false;
    out.reason = e.what();
  }
  out.index = v.index;
  out.rank = rank;
  out.wall_seconds = seconds_since(t0);
  return out;
}

/// What one rank ran: its outcomes, and whether it stopped on request.
struct RankShare {
  std::vector<VariantOutcome> mine;
  bool stopped = false;
};

/// Runs variants on this rank while any remain: the next index comes from the shared
/// counters on rank 0 (the next variant to start, and the variants finished, for progress
/// lines), incremented atomically.
RankShare run_share(MPI_Comm comm, int rank, const std::vector<Variant>& variants,
                    const VariantRunner& run, const VariantDone& done,
                    const std::function<bool()>& stop_requested,
                    const std::vector<std::size_t>* todo) {
  long* counter = nullptr;
  MPI_Win win;
  MPI_Win_allocate(rank == 0 ? static_cast<MPI_Aint>(2 * sizeof(long)) : 0, sizeof(long),
                   MPI_INFO_NULL, comm, &counter, &win);
  if (rank == 0) counter[0] = counter[1] = 0;
  MPI_Barrier(comm);
  MPI_Win_lock_all(0, win);

  RankShare share;
  const long one = 1;
  const std::size_t to_run = todo ? todo->size() : variants.size();
  for (;;) {
    if (stop_requested && stop_requested()) {
      share.stopped = true;
      break;
    }
    long next = 0;
    MPI_Fetch_and_op(&one, &next, MPI_LONG, 0, 0, MPI_SUM, win);
    MPI_Win_flush(0, win);
    if (next < 0 || static_cast<std::size_t>(next) >= to_run) break;
    const std::size_t pick =
        todo ? (*todo)[static_cast<std::size_t>(next)] : static_cast<std::size_t>(next);
    if (pick >= variants.size()) throw std::runtime_error("sweep: variant index out of range");
    const Variant& v = variants[pick];
    VariantOutcome out = run_one(v, run, rank);
    long finished = 0;
    MPI_Fetch_and_op(&one, &finished, MPI_LONG, 0, 1, MPI_SUM, win);
    MPI_Win_flush(0, win);
    out.finished = static_cast<std::size_t>(finished) + 1;
    out.to_run = to_run;
    if (done) done(v, out);
    share.mine.push_back(std::move(out));
  }
  MPI_Win_unlock_all(win);
  MPI_Win_free(&win);
  return share;
}

/// Every rank's packed share, concatenated on rank 0 (empty elsewhere), with each rank's
/// byte count and offset.
struct Gathered {
  std::vector<char> all;
  std::vector<int> counts, displs;
};

Gathered gather_shares(MPI_Comm comm, int rank, int size, const RankShare& share) {
  Packer pk;
  pk.put<std::uint8_t>(share.stopped ? 1 : 0);
  pk.put<std::uint64_t>(share.mine.size());
  for (const auto& o : share.mine) pack(pk, o);
  int nbytes = static_cast<int>(pk.bytes().size());
  Gathered g;
  g.counts.resize(static_cast<std::size_t>(size));
  g.displs.resize(static_cast<std::size_t>(size));
  MPI_Gather(&nbytes, 1, MPI_INT, g.counts.data(), 1, MPI_INT, 0, comm);
  if (rank == 0) {
    int total = 0;
    for (int r = 0; r < size; ++r) {
      g.displs[static_cast<std::size_t>(r)] = total;
      total += g.counts[static_cast<std::size_t>(r)];
    }
    g.all.resize(static_cast<std::size_t>(total));
  }
  MPI_Gatherv(pk.bytes().data(), nbytes, MPI_CHAR, g.all.data(), g.counts.data(), g.displs.data(),
              MPI_CHAR, 0, comm);
  return g;
}

/// Rank 0: the gathered outcomes in variant order; `seen` marks the variants that ran.
/// Returns whether any rank stopped on request.
bool unpack_shares(const Gathered& g, std::vector<VariantOutcome>& outcomes,
                   std::vector<bool>& seen) {
  bool any_stopped = false;
  for (std::size_t r = 0; r < g.counts.size(); ++r) {
    Unpacker up(g.all.data() + g.displs[r], static_cast<std::size_t>(g.counts[r]));
    any_stopped = (up.get<std::uint8_t>() != 0) || any_stopped;
    const auto n = up.get<std::uint64_t>();
    for (std::uint64_t i = 0; i < n; ++i) {
      VariantOutcome o = unpack(up);
      if (o.index >= outcomes.size() || seen[o.index]) {
        throw std::runtime_error("sweep: inconsistent variant results");
      }
      seen[o.index] = true;
      outcomes[o.index] = std::move(o);
    }
  }
  return any_stopped;
}

/// The variants that did not run: skipped (outside `todo`), or interrupted before they
/// started when a rank stopped; any other is an error.
void mark_not_run(std::vector<VariantOutcome>& outcomes, const std::vector<bool>& seen,
                  bool any_stopped, const std::vector<std::size_t>* todo) {
  std::vector<bool> wanted(outcomes.size(), todo == nullptr);
  if (todo) {
    for (const auto i : *todo) wanted[i] = true;
  }
  for (std::size_t i = 0; i < seen.size(); ++i) {
    if (seen[i]) continue;
    outcomes[i].index = i;
    if (!wanted[i]) {
      outcomes[i].skipped = true;
    } else if (any_stopped) {
      outcomes[i].interrupted = true;
      outcomes[i].reason = "interrupted before it started";
    } else {
      throw std::runtime_error("sweep: variant " + std::to_string(i) + " never ran");
    }
  }
}

}  // namespace

std::vector<VariantOutcome> run_variants(MPI_Comm comm, const std::vector<Variant>& variants,
                                         const VariantRunner& run, const VariantDone& done,
                                         const std::function<bool()>& stop_requested,
                                         const std::vector<std::size_t>* todo) {
  int rank = 0, size = 1;
  MPI_Comm_rank(comm, &rank);
  MPI_Comm_size(comm, &size);
  // 1. Run variants on this rank while any remain.
  const RankShare share = run_share(comm, rank, variants, run, done, stop_requested, todo);
  // 2. Gather every rank's outcomes on rank 0.
  const Gathered g = gather_shares(comm, rank, size, share);
  if (rank != 0) return {};
  // 3. Put them in variant order and account for the variants that did not run.
  std::vector<VariantOutcome> outcomes(variants.size());
  std::vector<bool> seen(variants.size(), false);
  const bool any_stopped = unpack_shares(g, outcomes, seen);
  mark_not_run(outcomes, seen, any_stopped, todo);
  return outcomes;
}

}  // namespace colchem
