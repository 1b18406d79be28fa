// Text summaries printed by the commands.
#pragma once

#include <string>

#include "core/background.hpp"
#include "io/scenario.hpp"

namespace colchem::app {

std::string summarize_scenario(const Scenario& sc, const Background& bg);

}  // namespace colchem::app
