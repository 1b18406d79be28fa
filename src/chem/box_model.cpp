// Box mode, dn/dt = P(n) - L(n) (cm^-3 s^-1) in one cell at fixed T and p, integrated by
// backward Euler with step doubling (chem/stiff_integrator.hpp): see chem/box_model.hpp.
#include "chem/box_model.hpp"

#include <cmath>

#include "chem/chemistry_operator.hpp"
#include "core/error.hpp"

namespace colchem {

std::vector<double> box_output_times(double duration_s, std::size_t count, bool log_spacing,
                                     double first_s) {
  std::vector<double> t{0.0};
  for (std::size_t i = 1; i <= count; ++i) {
    const double f = count == 1 ? 1.0 : static_cast<double>(i - 1) / static_cast<double>(count - 1);
    if (log_spacing) {
      t.push_back(count == 1 ? duration_s : first_s * std::pow(duration_s / first_s, f));
    } else {
      t.push_back(duration_s * static_cast<double>(i) / static_cast<double>(count));
    }
  }
  t.back() = duration_s;
  return t;
}

BoxResult run_box(const BoxProblem& pb) {
  const std::vector<double> T{pb.temperature_K};
  const std::vector<double> air{pb.air_cm3};
  ChemistryOperator op(pb.chemistry, T, air, {}, pb.bulk_mole_fraction, pb.solver);
  for (const auto& [channel, J] : pb.photolysis) {
    const std::size_t c = op.kinetics().channel_index(channel);
    if (c != Kinetics::npos) op.set_photolysis_rate(c, 0, J);
  }
  const Kinetics& kin = op.kinetics();
  BoxResult res;
  res.times_s = pb.times_s;
  res.species = kin.species_count();
  res.reactions = kin.reaction_count();
  for (std::size_t r = 0; r < res.reactions; ++r)
    res.reaction_index.push_back(kin.mechanism_reaction(r));
  const std::size_t S = res.species;
  const std::size_t R = res.reactions;
  const std::size_t nt = pb.times_s.size();
  res.n_cm3.resize(nt * S);
  res.production.resize(nt * S);
  res.loss.resize(nt * S);
  res.rates.resize(nt * R);
  std::vector<double> n = pb.initial_cm3;
  auto record = [&](std::size_t i) {
    std::copy(n.begin(), n.end(), res.n_cm3.begin() + static_cast<std::ptrdiff_t>(i * S));
    kin.production_loss(0, n.data(), res.production.data() + i * S, res.loss.data() + i * S,
                        res.rates.data() + i * R);
  };
  record(0);
  for (std::size_t i = 1; i < nt; ++i) {
    const double t0 = pb.times_s[i - 1];
    if (!op.implicit_step(n, t0, pb.times_s[i] - t0)) {
      throw RunError(ExitCode::kNotConverged,
                     "box integration failed between t = " + message_number(t0) + " s and " +
                         message_number(pb.times_s[i]) + " s (step size below the minimum)");
    }
    record(i);
  }
  res.stats = op.integrator_stats();
  return res;
}

BoxProblem box_problem(const BoxSpec& box) {
  BoxProblem pb;
  pb.chemistry = box.chemistry;
  pb.temperature_K = box.temperature_K;
  pb.air_cm3 = box.air_cm3;
  pb.bulk_mole_fraction = box.bulk_mole_fraction;
  pb.initial_cm3 = box.initial_cm3;
  pb.photolysis = box.photolysis;
  pb.times_s = box_output_times(box.duration_s, box.outputs, box.log_spacing, box.first_output_s);
  pb.solver = box.solver;
  return pb;
}

}  // namespace colchem
