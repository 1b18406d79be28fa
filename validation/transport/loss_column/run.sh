#!/usr/bin/env bash
# Reruns this validation case. Usage: validation/transport/loss_column/run.sh [BUILD_DIR]
exec "$(dirname "$0")/../run_case.sh" loss_column "$@"
