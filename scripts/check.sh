#!/usr/bin/env bash
# Runs exactly what CI runs.
exec bash "$(dirname "$0")/../.ci/run"
