// Rate-constant sanity checks (chem/rate_checks.hpp).
#include "chem/rate_checks.hpp"

#include <fmt/format.h>

#include <cmath>

#include "chem/rate_law.hpp"
#include "core/error.hpp"

namespace colchem {

void check_rates(const Mechanism& mech, std::span<const double> T, std::span<const double> air,
                 const std::map<std::string, double>& bulk, const RateLimits& lim) {
  for (const auto& rx : mech.reactions) {
    if (rx.rate.form == RateForm::kPhotolysis) continue;
    const double eff = third_body_weight(mech, rx, bulk);
    const int order = rx.rate_order();
    for (std::size_t j = 0; j < T.size(); ++j) {
      const double M = eff * air[j];
      const double k = rate_constant(rx.rate, T[j], M);
      const double k0 = rx.rate.low_pressure_limit(T[j]);
      auto bad = [&](const std::string& expected, double value, const std::string& unit,
                     const std::string& limit) {
        throw InputError(ExitCode::kInputData, rx.where, "rate",
                         expected + " for " + "reaction '" + rx.equation + "'",
                         fmt::format("{:.4g}{}{} at T = {:.1f} K, n_air = {:.3g} cm-3", value,
                                     unit.empty() ? "" : " ", unit, T[j], air[j]),
                         limit.empty() ? "limits are common practice, no source"
                                       : "limits are common practice, no source; a world that "
                                         "needs more sets chemistry.rate_limits." +
                                             limit);
      };
      if (!std::isfinite(k) || k < 0.0) bad("a finite, non-negative rate constant", k, "", "");
      if (order == 1 && k > lim.first_order_s) {
        bad(fmt::format("a first-order rate constant below {:g} s-1", lim.first_order_s), k, "s-1",
            "first_order");
      }
      if (order == 2 && k > lim.bimolecular_cm3_s) {
        bad(fmt::format("a bimolecular rate constant below {:g} cm3 s-1", lim.bimolecular_cm3_s), k,
            "cm3 s-1", "bimolecular");
      }
      if (order == 3 && k > lim.termolecular_cm6_s) {
        bad(fmt::format("a termolecular rate constant below {:g} cm6 s-1", lim.termolecular_cm6_s),
            k, "cm6 s-1", "termolecular");
      }
      if (k0 > lim.termolecular_cm6_s) {
        bad(fmt::format("a low-pressure limit k0 below {:g} cm6 s-1", lim.termolecular_cm6_s), k0,
            "cm6 s-1", "termolecular");
      }
    }
  }
}

}  // namespace colchem
