# The bad-input catalogue (issue 16): one case per class of malformed input and input kind,
# each asserting the documented exit code (README "Exit codes") and the parts of the
# message: file (and line where there is one), key or variable, expected, found.
# Included from cli_tests.cmake (colchem_cli_test, BAD, CFG defined there).
set(BOX_BAD ${CMAKE_SOURCE_DIR}/tests/chem/bad/box_unbalanced.yaml)

# --- YAML structure (scenario, exit 3; mechanism, exit 4; --set, exit 2) ----------------
colchem_cli_test(bad.duplicate_key 3
  "duplicate_key.yaml:17:3: 'grid.cells': expected each key once in a map, found 'cells' again \\(first at line 16\\)"
  $<TARGET_FILE:colchem> check ${BAD}/duplicate_key.yaml)
colchem_cli_test(bad.duplicate_section 3
  "duplicate_section.yaml:28:1: 'solver': expected each key once in a map, found 'solver' again \\(first at line 26\\)"
  $<TARGET_FILE:colchem> check ${BAD}/duplicate_section.yaml)
colchem_cli_test(bad.duplicate_section_run 3
  "duplicate_section.yaml:28:1: 'solver': expected each key once in a map"
  $<TARGET_FILE:colchem> run ${BAD}/duplicate_section.yaml -o duplicate_section.nc)
colchem_cli_test(bad.list_as_key 3
  "map_key.yaml:17:3: 'grid': expected a key that is a single word or value, found a list used as a key"
  $<TARGET_FILE:colchem> check ${BAD}/map_key.yaml)
colchem_cli_test(bad.mechanism_map_key 4
  "mech_map_key.yaml:7:8: 'species.3': expected a key that is a single word or value, found a map used as a key"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_map_key.yaml)
colchem_cli_test(bad.mechanism_duplicate_key 4
  "mech_duplicate_key.yaml:13:9: 'modules.0.reactions.0.rate': expected each key once in a map, found 'rate' again \\(first at line 12\\)"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_duplicate_key.yaml)
colchem_cli_test(bad.mechanism_duplicate_key_check 4
  "mech_duplicate_key.yaml:13:9: 'modules.0.reactions.0.rate': expected each key once"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.mechanism=${BAD}/mech_duplicate_key.yaml)

# --- Numbers that would overflow (mechanism, exit 4) -------------------------------------
colchem_cli_test(bad.coefficient_digits 4
  "mech_huge_coefficient.yaml:13:19: 'modules.0.reactions.1.equation': expected a stoichiometric coefficient from 1 to 999, found '12345678901' in '12345678901 ClONO2 -> ClO \\+ NO2'"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_huge_coefficient.yaml)
colchem_cli_test(bad.coefficient_overflow 4
  "mech_overflow.yaml:13:19: 'modules.0.reactions.0.equation': expected a stoichiometric coefficient from 1 to 999, found '2147483647'"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_overflow.yaml)
colchem_cli_test(bad.formula_count 4
  "mech_formula_count.yaml:7:26: 'species.2.formula': expected a chemical formula, found 'O99999999999' \\(a count above 9999\\)"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_formula_count.yaml)

# --- --set paths (exit 2) -----------------------------------------------------------------
colchem_cli_test(bad.set_huge_index 2
  "--set chemistry.modules.99999999999999999999=base: 'chemistry.modules.99999999999999999999': expected an index below 2, found '99999999999999999999'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.modules.99999999999999999999=base)
colchem_cli_test(bad.set_index_range 2
  "'chemistry.modules.2': expected an index below 2, found '2'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.modules.2=base)
colchem_cli_test(bad.set_key_under_scalar 2
  "--set grid.cells.x=1: 'grid.cells.x': expected a path through maps, found a single value at 'cells', which has no key 'x'"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml --set grid.cells.x=1)
colchem_cli_test(bad.set_key_under_scalar_deep 2
  "'grid.cells.x.y': expected a path through maps, found a single value at 'x'"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml --set grid.cells.x.y=1)
colchem_cli_test(bad.set_name_in_list 2
  "'chemistry.modules.first': expected a list index \\(0, 1, ...\\) after a list, found 'first'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.modules.first=base)
colchem_cli_test(bad.set_map_key 2
  "--set grid=\\{\\[a\\]: 1\\}: 'grid': expected a key that is a single word or value, found a list used as a key"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml "--set=grid={[a]: 1}")
colchem_cli_test(bad.set_duplicate_key 2
  "'grid.cells': expected each key once in a map, found 'cells' again"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml "--set=grid={cells: 5, cells: 6}")

# --- NetCDF inputs (exit 4): run --restart, photo --from, budget, compare ---------------
# The files come from the fixture cli.bad_netcdf_setup (tests/cli/bad_netcdf_setup.sh).
set(NCW ${CMAKE_CURRENT_BINARY_DIR}/bad_nc)
set(RCOL ${CMAKE_SOURCE_DIR}/tests/solve/restart/restart_column.yaml)
set(OBS ${CMAKE_CURRENT_LIST_DIR}/sweep/tellin_so2_invented.csv)
add_test(NAME cli.bad_netcdf_setup
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/bad_netcdf_setup.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR} ${NCW})
set_tests_properties(cli.bad_netcdf_setup PROPERTIES FIXTURES_SETUP bad_netcdf)
function(colchem_nc_test name code regex)
  colchem_cli_test(${name} ${code} "${regex}" ${ARGN})
  set_tests_properties(cli.${name} PROPERTIES FIXTURES_REQUIRED bad_netcdf)
endfunction()

set(ND_SHAPE "nd_shape.nc: 'number_density': expected a \\(species, altitude\\) variable of shape \\(3, 6\\), found shape \\(3, 5\\)")
colchem_nc_test(bad.nc_restart_shape 4 "${ND_SHAPE}"
  $<TARGET_FILE:colchem> run ${RCOL} --restart ${NCW}/nd_shape.nc -o restart_shape.nc)
colchem_nc_test(bad.nc_photo_shape 4 "${ND_SHAPE}"
  $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml --from ${NCW}/nd_shape.nc)
set(ZERO "zero_altitude.nc: 'altitude': expected at least one altitude cell, found a zero-length dimension")
colchem_nc_test(bad.nc_restart_zero_altitude 4 "${ZERO}"
  $<TARGET_FILE:colchem> run ${RCOL} --restart ${NCW}/zero_altitude.nc -o restart_zero.nc)
colchem_nc_test(bad.nc_photo_zero_altitude 4 "${ZERO}"
  $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml --from ${NCW}/zero_altitude.nc)
colchem_nc_test(bad.nc_budget_zero_altitude 4 "${ZERO}"
  $<TARGET_FILE:colchem> budget ${NCW}/zero_altitude.nc -s SO2)
colchem_nc_test(bad.nc_compare_zero_altitude 4 "${ZERO}"
  $<TARGET_FILE:colchem> compare ${NCW}/zero_altitude.nc ${OBS} --no-write)
set(DESC "descending.nc: 'altitude': expected strictly increasing values \\(bottom to top\\), found [0-9.]+ after [0-9.]+ at index 1")
colchem_nc_test(bad.nc_restart_descending 4 "${DESC}"
  $<TARGET_FILE:colchem> run ${RCOL} --restart ${NCW}/descending.nc -o restart_desc.nc)
colchem_nc_test(bad.nc_photo_descending 4 "${DESC}"
  $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml --from ${NCW}/descending.nc)
colchem_nc_test(bad.nc_compare_descending 4 "${DESC}"
  $<TARGET_FILE:colchem> compare ${NCW}/descending.nc ${OBS} --no-write)
colchem_nc_test(bad.nc_budget_descending 4
  "descending.nc: 'altitude_edge': expected strictly increasing values \\(bottom to top\\)"
  $<TARGET_FILE:colchem> budget ${NCW}/descending.nc -s SO2)
set(NAN "nan_density.nc: 'number_density': expected finite values, found nan at index 3")
colchem_nc_test(bad.nc_restart_nan 4 "${NAN}"
  $<TARGET_FILE:colchem> run ${RCOL} --restart ${NCW}/nan_density.nc -o restart_nan.nc)
colchem_nc_test(bad.nc_photo_nan 4 "${NAN}"
  $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml --from ${NCW}/nan_density.nc)
colchem_nc_test(bad.nc_compare_nan 4 "${NAN}"
  $<TARGET_FILE:colchem> compare ${NCW}/nan_density.nc ${OBS} --no-write)
set(NEG "negative.nc: 'number_density': expected number densities of at least zero .*, found -[0-9.e+]+ cm-3 for [A-Za-z0-9]+ at altitude index 0")
colchem_nc_test(bad.nc_restart_negative 4 "${NEG}"
  $<TARGET_FILE:colchem> run ${RCOL} --restart ${NCW}/negative.nc -o restart_neg.nc)
colchem_nc_test(bad.nc_photo_negative 4 "${NEG}"
  $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml --from ${NCW}/negative.nc)
colchem_nc_test(bad.nc_budget_rate_shape 4
  "rate_shape.nc: 'reaction_rate': expected a \\(reaction, altitude\\) variable of shape \\([0-9]+, 6\\), found shape \\([0-9]+, 5\\)"
  $<TARGET_FILE:colchem> budget ${NCW}/rate_shape.nc -s SO2)
colchem_nc_test(bad.nc_budget_stoichiometry_shape 4
  "stoich_shape.nc: 'net_stoichiometry': expected a \\(reaction, species\\) variable of shape \\(([0-9]+), 3\\), found shape \\(\\1, [0-9]+\\)"
  $<TARGET_FILE:colchem> budget ${NCW}/stoich_shape.nc -s SO2)
colchem_nc_test(bad.nc_budget_species_type 4
  "species_double.nc: 'species': expected a one-dimensional variable of strings \\(NC_STRING\\), found another type"
  $<TARGET_FILE:colchem> budget ${NCW}/species_double.nc -s SO2)
colchem_nc_test(bad.nc_compare_species_type 4
  "species_double.nc: 'species': expected a one-dimensional variable of strings"
  $<TARGET_FILE:colchem> compare ${NCW}/species_double.nc ${OBS} --no-write)
# The unaltered file passes the same readers (so the refusals above are the defects').
colchem_nc_test(bad.nc_budget_good 0 "SO2: column production"
  $<TARGET_FILE:colchem> budget ${NCW}/good.nc -s SO2)

# --- check builds everything run builds (exit as run) -----------------------------------
colchem_cli_test(bad.check_unknown_species 3 "tellin.yaml: 'species.SO3x': expected a species of the mechanism"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set species.SO3x.initial=1e-9)
colchem_cli_test(bad.check_injection_species 3
  "'injections': expected a species of the mechanism, found unknown species 'XYZ'"
  $<TARGET_FILE:colchem> check ${RCOL} --set "injections=[{species: XYZ, column: 1e16 cm-2, time: 0.5 day, from: 13 km, to: 15 km}]")
colchem_cli_test(bad.check_missing_observations 4
  "no_such_observations.csv: expected a readable table file, found no such file"
  $<TARGET_FILE:colchem> check ${RCOL} --set observations=no_such_observations.csv)
set(MISSING_CHANNEL "photo_missing_channel.yaml: 'channels': expected a channel named 'SO3_SO2_O' \\(used by the mechanism\\), found none")
colchem_cli_test(bad.check_missing_channel 4 "${MISSING_CHANNEL}"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set photolysis.data=${BAD}/photo_missing_channel.yaml)
colchem_cli_test(bad.run_missing_channel 4 "${MISSING_CHANNEL}"
  $<TARGET_FILE:colchem> run ${CFG}/tellin.yaml --set photolysis.data=${BAD}/photo_missing_channel.yaml -o missing_channel.nc)

# --- Output paths that name an input (exit 6; on copies, so that a failure harms nothing) --
colchem_cli_test(bad.output_onto_scenario 6
  "'-o/--output': expected an output path that is not one of the inputs, found the scenario file '[^']*onto_input/restart_column.yaml'"
  sh -c "rm -rf onto_input && cp -r ${CMAKE_SOURCE_DIR}/tests/solve/restart onto_input && $<TARGET_FILE:colchem> run onto_input/restart_column.yaml -o ./onto_input/restart_column.yaml")
colchem_cli_test(bad.output_onto_box_config 6
  "expected an output path that is not one of the inputs, found the box configuration '[^']*box_copy.yaml'"
  sh -c "cp ${CHEMV}/box_equilibrium/box.yaml ${CHEMV}/box_equilibrium/mechanism.yaml . && cp box.yaml box_copy.yaml && $<TARGET_FILE:colchem> box box_copy.yaml -o box_copy.yaml")
colchem_nc_test(bad.output_onto_observations 6
  "expected an output path that is not one of the inputs, found the observation file '[^']*obs_copy.csv'"
  sh -c "cp ${OBS} ${NCW}/obs_copy.csv && $<TARGET_FILE:colchem> compare ${NCW}/good.nc ${NCW}/obs_copy.csv -o ${NCW}/obs_copy.csv")
colchem_nc_test(bad.output_onto_run_file 6
  "expected an output path that is not one of the inputs, found the run file '[^']*good_copy.nc'"
  sh -c "cp ${NCW}/good.nc ${NCW}/good_copy.nc && $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml --from ${NCW}/good_copy.nc -o ${NCW}/good_copy.nc")

# --- Further input kinds (each already refused; kept here so that it stays so) ----------
set(BOXV ${CMAKE_SOURCE_DIR}/validation/chem/box_equilibrium/box.yaml)
# Scenario values (exit 3).
colchem_cli_test(bad.scenario_zero_cells 3 "--set grid.cells=0: 'grid.cells': expected a number of cells from 1 to 100000, found '0'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set grid.cells=0)
colchem_cli_test(bad.scenario_negative_radius 3 "'planet.radius': expected a positive radius, found '-5 km'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=planet.radius=-5 km")
colchem_cli_test(bad.scenario_infinite_value 3 "'grid.top': expected a finite value, found '1e400 km'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=grid.top=1e400 km")
colchem_cli_test(bad.scenario_mixing_ratio 3 "'species.SO2.initial': expected a mixing ratio: a number from 0 to 1 or a quantity such as '3 ppm', found 'abc'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set species.SO2.initial=abc)
colchem_cli_test(bad.scenario_solver_method 3 "'solver.method': expected one of: steady, transient, split_steady, found 'explicit'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set solver.method=explicit)
colchem_cli_test(bad.scenario_unknown_module 3 "'chemistry.modules.0': expected a module of mechanism 'tellin', found unknown module 'nosuch'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.modules=[nosuch])
colchem_cli_test(bad.scenario_unknown_parameter 3 "'chemistry.parameters.nosuch': expected a parameter of mechanism 'tellin', found unknown parameter 'nosuch'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.parameters.nosuch=1)
colchem_cli_test(bad.scenario_rt_choice 3 "'photolysis.radiative_transfer.scheme': expected one of: direct_beam, two_stream, found 'two_streem'; did you mean 'two_stream'\\?"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set photolysis.radiative_transfer.scheme=two_streem)
# Paths that are directories or files of the wrong kind.
colchem_cli_test(bad.table_is_directory 4 "tests/cli/bad: expected a table file, found a directory"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set atmosphere.temperature=${BAD})
colchem_cli_test(bad.mechanism_is_directory 4 "tests/cli/bad: expected a YAML file, found a directory"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.mechanism=${BAD})
colchem_cli_test(bad.photolysis_data_is_table 4 "o2.csv:[0-9]+:1: expected a map of sections at the top level, found a list or a single value"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set photolysis.data=${CFG}/photolysis/o2.csv)
colchem_nc_test(bad.run_file_is_yaml 4 "tellin.yaml: expected a readable NetCDF file written by colchem, found NetCDF: Unknown file format"
  $<TARGET_FILE:colchem> compare ${CFG}/tellin.yaml ${OBS} --no-write)
# Box configurations (exit 3).
colchem_cli_test(bad.box_pressure_unit 3 "'box.pressure': expected a number with a unit, such as '1 bar', found '5' with no unit"
  $<TARGET_FILE:colchem> box ${BOXV} --set box.pressure=5)
colchem_cli_test(bad.box_negative_duration 3 "'box.duration': expected a positive duration, found '-1 d'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=box.duration=-1 d")
colchem_cli_test(bad.box_unknown_species 3 "'box.initial.XYZ': expected a species of mechanism 'clo-dimer', found 'XYZ'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=box.initial.XYZ=1 ppb")
# Observation files (exit 4), with the row's line.
colchem_nc_test(bad.obs_not_number 4 "obs_not_number.csv:4: 'value': expected a finite number, found 'abc'"
  $<TARGET_FILE:colchem> compare ${NCW}/good.nc ${BAD}/obs_not_number.csv --no-write)
colchem_nc_test(bad.obs_unknown_species 4 "obs_unknown_species.csv:4: 'species': expected a species of the model \\(SO2, OH, HSO3\\), found 'XYZ'"
  $<TARGET_FILE:colchem> compare ${NCW}/good.nc ${BAD}/obs_unknown_species.csv --no-write)
colchem_nc_test(bad.obs_negative_uncertainty 4 "obs_negative_sigma.csv:4: 'uncertainty': expected a positive uncertainty for a detection, found -2e-11 \\(as a mole fraction\\)"
  $<TARGET_FILE:colchem> compare ${NCW}/good.nc ${BAD}/obs_negative_sigma.csv --no-write)
# Sweep configurations (exit 3).
colchem_cli_test(bad.sweep_unknown_key 3 "'sweep.variants': expected a known key in 'sweep', found unknown key 'variants'"
  $<TARGET_FILE:colchem> sweep ${CMAKE_CURRENT_LIST_DIR}/sweep/tellin_sweep.yaml --set sweep.variants=3)
# Command lines (exit 2).
colchem_cli_test(bad.cli_missing_config 2 "CONFIG is required" $<TARGET_FILE:colchem> check)
colchem_cli_test(bad.cli_missing_restart 2 "--restart: File does not exist: no_such_restart.nc"
  $<TARGET_FILE:colchem> run ${CFG}/tellin.yaml --restart no_such_restart.nc)
colchem_cli_test(bad.cli_missing_run_file 2 "RUN: File does not exist: no_such_run.nc"
  $<TARGET_FILE:colchem> budget no_such_run.nc -s SO2)

# --- Sweeps (issue 16): no variant converged (5); a module the mechanism lacks (3) --------
colchem_cli_test(bad.sweep_all_failed 5
  "no variant of the sweep converged: 0 of 2 \\(2 failed\\); the reasons are in the status column of sweep_all_failed.csv"
  $<TARGET_FILE:colchem> sweep ${CMAKE_SOURCE_DIR}/tests/cli/sweep/tellin_sweep_all_fail.yaml
  -o sweep_all_failed.nc --table sweep_all_failed.csv)
colchem_cli_test(bad.sweep_unknown_module 3
  "tellin_sweep_unknown_module.yaml:10:9: 'modules.typo': expected a module of mechanism 'tellin' \\(base, sulfur\\), found unknown module 'sulphur'; did you mean 'sulfur'\\?"
  $<TARGET_FILE:colchem> sweep ${CMAKE_SOURCE_DIR}/tests/cli/sweep/tellin_sweep_unknown_module.yaml
  -o sweep_unknown_module.nc --table sweep_unknown_module.csv)

# --- Absurd or inconsistent values (issue 16, item 3) --------------------------------------
colchem_cli_test(bad.mechanism_circular_requires 4
  "mech_circular_requires.yaml:9:15: 'modules.0.requires': expected module requirements without a cycle, found the cycle a -> b -> a"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_circular_requires.yaml)
colchem_cli_test(bad.mechanism_circular_requires_check 4
  "mech_circular_requires.yaml:9:15: 'modules.0.requires': expected module requirements without a cycle"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.mechanism=${BAD}/mech_circular_requires.yaml)
colchem_cli_test(bad.negative_absolute_density 3
  "'solver.absolute_density': expected a positive"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set "solver.absolute_density=-1 cm-3")
colchem_cli_test(bad.negative_relative_tolerance 3
  "'solver.transient.relative_tolerance': expected a positive"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set solver.transient.relative_tolerance=-1e-3)
colchem_cli_test(bad.unknown_command 2
  "colchem: unknown command 'frobnicate'; expected one of: check, run, .*box.* \\(colchem --help\\)"
  $<TARGET_FILE:colchem> frobnicate ${CFG}/tellin.yaml)
colchem_cli_test(bad.unknown_command_after_option 2
  "colchem: unknown command 'rn'; expected one of: check, run"
  $<TARGET_FILE:colchem> --log-level warn rn ${CFG}/tellin.yaml)
colchem_nc_test(bad.compare_too_many_fitted 2
  "command line: '-p/--fitted-parameters': expected fewer fitted parameters than the observation points of each species inside the model grid \\(SO2: [0-9]+ in .*tellin_so2_invented.csv\\), found 1000"
  $<TARGET_FILE:colchem> compare ${NCW}/good.nc ${OBS} --no-write -p 1000)
# A 10 MB value is clipped in the message: its first 200 characters and its length.
colchem_cli_test(bad.huge_value 3
  "huge_value.yaml:16:10: 'grid.cells': expected a whole number, found 'x{199}\\.\\.\\. \\(10000002 characters in all\\)"
  sh -c "/usr/bin/python3 ${BAD}/make_huge_value.py ${CFG}/pyrene.yaml huge_value.yaml && exec $<TARGET_FILE:colchem> check huge_value.yaml")
