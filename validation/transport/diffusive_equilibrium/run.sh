#!/usr/bin/env bash
# Reruns this validation case. Usage: validation/transport/diffusive_equilibrium/run.sh [BUILD_DIR]
exec "$(dirname "$0")/../run_case.sh" diffusive_equilibrium "$@"
