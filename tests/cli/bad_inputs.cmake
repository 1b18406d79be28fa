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
  "mech_duplicate_key.yaml:14:9: 'modules.0.reactions.0.rate': expected each key once in a map, found 'rate' again \\(first at line 13\\)"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_duplicate_key.yaml)
colchem_cli_test(bad.mechanism_duplicate_key_check 4
  "mech_duplicate_key.yaml:14:9: 'modules.0.reactions.0.rate': expected each key once"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.mechanism=${BAD}/mech_duplicate_key.yaml)

# --- Numbers that would overflow (mechanism, exit 4) -------------------------------------
colchem_cli_test(bad.coefficient_digits 4
  "mech_huge_coefficient.yaml:15:19: 'modules.0.reactions.1.equation': expected a stoichiometric coefficient from 1 to 999, found '12345678901' in '12345678901 ClONO2 -> ClO \\+ NO2'"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_huge_coefficient.yaml)
colchem_cli_test(bad.coefficient_overflow 4
  "mech_overflow.yaml:14:19: 'modules.0.reactions.0.equation': expected a stoichiometric coefficient from 1 to 999, found '2147483647'"
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
  "'grid.cells.x.y': expected a path through maps, found a single value at 'cells', which has no key 'x'"
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
  "species_double.nc: 'species_name': expected a one-dimensional variable of strings \\(NC_STRING\\), found another type"
  $<TARGET_FILE:colchem> budget ${NCW}/species_double.nc -s SO2)
colchem_nc_test(bad.nc_compare_species_type 4
  "species_double.nc: 'species_name': expected a one-dimensional variable of strings"
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

# --- Rate-constant sanity limits (issue 16): refused by default, widened by the user ------
# Tellin's SO3 + 2 H2O -> H2SO4 + H2O, k = 3.9e-41 exp(6830.6/T) cm6 s-1 (mechanism line
# 122), is 3.9e-41 exp(6830.6/160) = 1.354e-22 cm6 s-1 at 160 K: above the default
# termolecular limit of 1e-22 (common practice, no source), below a widened 1e-21.
set(COLD "--set=atmosphere.temperature={isothermal: 160 K}")
set(TERMO_REFUSED "tellin.yaml:129:9: 'rate': expected a termolecular rate constant below 1e-22 cm6 s-1 for reaction 'SO3 \\+ 2 H2O -> H2SO4 \\+ H2O', found 1.354e-22 cm6 s-1 at T = 160.0 K, n_air = [0-9.e+]+ cm-3; limits are common practice, no source; a world that needs more sets chemistry.rate_limits.termolecular")
colchem_cli_test(bad.rate_limit_cold_world 4 "${TERMO_REFUSED}"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml ${COLD})
colchem_cli_test(bad.rate_limit_cold_world_widened 0 "46 of 47 active reactions balanced"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml ${COLD} "--set=chemistry.rate_limits.termolecular=1e-21 cm6 s-1")
colchem_cli_test(bad.rate_limit_cold_world_run 4 "${TERMO_REFUSED}"
  $<TARGET_FILE:colchem> run ${CFG}/tellin.yaml ${COLD} -o rate_limit_cold.nc)
colchem_cli_test(bad.rate_limit_cold_box 4 "${TERMO_REFUSED}"
  $<TARGET_FILE:colchem> box ${BAD}/box_cold.yaml -o box_cold_refused.nc)
colchem_cli_test(bad.rate_limit_cold_box_widened 0 "final state \\(number density cm-3, mole fraction\\)"
  $<TARGET_FILE:colchem> box ${BAD}/box_cold.yaml "--set=chemistry.rate_limits={termolecular: 1e-21 cm6 s-1}" -o box_cold_widened.nc)
colchem_cli_test(bad.rate_limit_first_order 4
  "mech_first_order_absurd.yaml:12:9: 'rate': expected a first-order rate constant below 1e\\+20 s-1 for reaction 'O3 -> O2 \\+ O', found 1e\\+25 s-1 at T = 250.0 K.*sets chemistry.rate_limits.first_order"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_first_order_absurd.yaml)
colchem_cli_test(bad.rate_limit_negative 3
  "'chemistry.rate_limits.termolecular': expected a positive, finite limit in cm6 s-1, found '-1 cm6 s-1'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=chemistry.rate_limits.termolecular=-1 cm6 s-1")
colchem_cli_test(bad.rate_limit_infinite 3
  "'chemistry.rate_limits.bimolecular': expected a finite value, found '1e400 cm3 s-1'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=chemistry.rate_limits.bimolecular=1e400 cm3 s-1")
colchem_cli_test(bad.rate_limit_unit 3
  "'chemistry.rate_limits.bimolecular': expected a unit convertible to 'cm3 s-1'.*found 'cm6 s-1'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=chemistry.rate_limits.bimolecular=1e-8 cm6 s-1")
colchem_cli_test(bad.rate_limit_unknown_key 3
  "'chemistry.rate_limits.termolecularr': expected a known key in 'chemistry.rate_limits', found unknown key 'termolecularr'; did you mean 'termolecular'\\?"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=chemistry.rate_limits.termolecularr=1e-21 cm6 s-1")
colchem_cli_test(bad.rate_limit_box_negative 3
  "'chemistry.rate_limits.first_order': expected a positive, finite limit in s-1, found '0 s-1'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=chemistry.rate_limits.first_order=0 s-1")

# --- Values without physical sense (issue 16): refused at their key, not blamed later ----
colchem_cli_test(bad.scenario_huge_pressure 3
  "'atmosphere.pressure.hydrostatic.base': expected a pressure of at most 1e5 bar \\(common practice, no source\\), found '1e300 bar'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=atmosphere.pressure.hydrostatic.base=1e300 bar")
colchem_cli_test(bad.scenario_hot_world 3
  "'atmosphere.temperature.isothermal': expected a temperature from 1 K to 1e5 K \\(common practice, no source\\), found '1e300 K'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=atmosphere.temperature={isothermal: 1e300 K}")
colchem_cli_test(bad.scenario_frozen_world 3
  "'atmosphere.temperature.isothermal': expected a temperature from 1 K to 1e5 K \\(common practice, no source\\), found '1e-300 K'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=atmosphere.temperature={isothermal: 1e-300 K}")
colchem_cli_test(bad.scenario_huge_eddy 3
  "'atmosphere.eddy_diffusion.constant': expected a diffusion coefficient of at most 1e12 cm2 s-1 \\(common practice, no source\\), found '1e300 cm2 s-1'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=atmosphere.eddy_diffusion={constant: 1e300 cm2 s-1}")
colchem_cli_test(bad.scenario_star_distance 3 "'planet.star_distance': expected a positive distance, found '0 au'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=planet.star_distance=0 au")
colchem_cli_test(bad.scenario_top_below_bottom 3 "'grid.top': expected a top above the bottom, found '5 km'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=grid.top=5 km")
colchem_cli_test(bad.scenario_mixing_ratio_above_one 3 "'species.SO2.initial': expected a mixing ratio from 0 to 1, found '2'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set species.SO2.initial=2)
colchem_cli_test(bad.scenario_bulk_sum 3
  "'atmosphere.bulk_composition': expected mole fractions summing to 1 \\(within 0.001\\), found a sum of 0.7104"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=atmosphere.bulk_composition={N2: 0.5, O2: 0.21, CO2: 0.0004}")
colchem_cli_test(bad.scenario_parameter_range 3
  "'chemistry.parameters.sulfate_removal_scale': expected a value of 'sulfate_removal_scale' within \\[0.25, 4\\], found 100"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.parameters.sulfate_removal_scale=100)
colchem_cli_test(bad.box_hot 3
  "'box.temperature': expected a temperature from 1 K to 1e5 K \\(common practice, no source\\), found '1e300 K'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=box.temperature=1e300 K")
colchem_cli_test(bad.box_huge_pressure 3
  "'box.pressure': expected a pressure of at most 1e5 bar \\(common practice, no source\\), found '1e300 bar'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=box.pressure=1e300 bar")
colchem_cli_test(bad.box_negative_atol 3 "'solver.atol': expected a positive absolute tolerance, found '-1 cm-3'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=solver.atol=-1 cm-3")
colchem_cli_test(bad.box_rtol 3 "'solver.rtol': expected a relative tolerance between 0 and 1 \\(exclusive\\), found '2'"
  $<TARGET_FILE:colchem> box ${BOXV} --set solver.rtol=2)
colchem_cli_test(bad.box_bulk_sum 3
  "box.yaml:[0-9]+:[0-9]+: 'box.bulk_composition': expected mole fractions summing to 1 \\(within 0.001\\), found a sum of 0.5"
  $<TARGET_FILE:colchem> box ${BOXV} --set box.bulk_composition.N2=0.5)
colchem_cli_test(bad.box_zero_outputs 3 "'box.outputs': expected a number of output times from 1 to 1000000, found '0'"
  $<TARGET_FILE:colchem> box ${BOXV} --set box.outputs=0)
colchem_cli_test(bad.box_first_output 3 "'box.first_output': expected a first output time in \\(0, duration\\], found '20 d'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=box.first_output=20 d")
colchem_cli_test(bad.box_unknown_channel 3 "'box.photolysis.NOPE': expected a photolysis channel named by a reaction, found 'NOPE'"
  $<TARGET_FILE:colchem> box ${BOXV} "--set=box.photolysis.NOPE=1e-3 s-1")

# --- Mechanism files (exit 4), one defect each, through a box and through check --------
colchem_cli_test(bad.mechanism_undeclared 4
  "mech_undeclared.yaml:13:19: 'modules.0.reactions.0.equation': expected species declared under 'species', found undeclared 'Cl' in reaction 'O3 \\+ Cl -> ClO \\+ O2'; did you mean 'ClO'\\?"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_undeclared.yaml)
colchem_cli_test(bad.mechanism_negative_rate 4
  "mech_negative_rate.yaml:12:9: 'rate': expected a finite, non-negative rate constant for reaction 'O \\+ O3 -> O2 \\+ O2', found -2.111e-15 at T = 250.0 K"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_negative_rate.yaml)
colchem_cli_test(bad.mechanism_rate_units 4
  "mech_rate_units.yaml:14:57: 'modules.0.reactions.0.rate.units': expected 'cm3 s-1' \\(or a unit convertible to it\\) for the order-2 reaction 'O \\+ O3 -> O2 \\+ O2', found 'cm6 s-1'"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_rate_units.yaml)
colchem_cli_test(bad.mechanism_photolysis_no_hv 4
  "mech_photolysis_no_hv.yaml:14:15: 'modules.0.reactions.0.rate': expected 'hv' among the reactants of a photolysis reaction, found reaction 'O3 -> O2 \\+ O'"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_photolysis_no_hv.yaml)
colchem_cli_test(bad.mechanism_duplicate_id 4
  "mech_duplicate_id.yaml:15:13: 'modules.0.reactions.1.id': expected a reaction id used once, found 'o_o3' for reaction 'O \\+ O3 -> O2 \\+ O2', already at line 12 for 'O \\+ O3 -> O2 \\+ O2'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set chemistry.mechanism=${BAD}/mech_duplicate_id.yaml)
colchem_cli_test(bad.mechanism_missing_id 4
  "mech_missing_id.yaml:12:9: 'modules.0.reactions.0': expected an `id` for every reaction \\(short and unique in the file, e.g. 'o_o3'\\), found none for 'O \\+ O3 -> O2 \\+ O2'"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_missing_id.yaml)
colchem_cli_test(bad.mechanism_bad_id 4
  "mech_bad_id.yaml:12:13: 'modules.0.reactions.0.id': expected a reaction id: a letter, then at most 31 letters, digits, '_', '.' or '-', found 'O \\+ O3'"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_bad_id.yaml)
colchem_cli_test(bad.mechanism_old_duplicate 4
  "mech_old_duplicate.yaml:18:20: 'modules.0.reactions.1.duplicate': expected no `duplicate` key: reactions with one equation are told apart by their `id`s, found `duplicate`; remove it and give each reaction its own `id`"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_old_duplicate.yaml)
colchem_cli_test(bad.mechanism_old_efficiencies 4
  "mech_old_efficiencies.yaml:15:23: 'modules.0.reactions.0.efficiencies': expected `third_body_weights` \\(`efficiencies` was renamed `third_body_weights`\\), found `efficiencies`"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_old_efficiencies.yaml)
colchem_cli_test(bad.mechanism_unknown_key 4
  "mech_unknown_key.yaml:15:9: 'modules.0.reactions.0.sorce': expected a known key in 'modules.0.reactions.0', found unknown key 'sorce'; did you mean 'source'\\?"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_unknown_key.yaml)
colchem_cli_test(bad.mechanism_parameter_range 4
  "mech_parameter_range.yaml:11:31: 'parameters.0.default': expected a default within \\[0.1, 10\\] for parameter 'o3_scale', found 20"
  $<TARGET_FILE:colchem> box ${BOX_BAD} --set chemistry.mechanism=${BAD}/mech_parameter_range.yaml)

# --- Photolysis data files (exit 4) -------------------------------------------------------
colchem_cli_test(bad.photo_negative_yield 4
  "photo_negative_yield.yaml:30:74: 'channels.8.quantum_yield': expected a quantum yield from 0 to 1, found '-0.5'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set photolysis.data=${BAD}/photo_negative_yield.yaml)
colchem_cli_test(bad.photo_unknown_absorber 4
  "photo_unknown_absorber.yaml:30:33: 'channels.8.absorber': expected an absorber declared under 'absorbers', found 'SO4'; did you mean 'SO2'\\?"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set photolysis.data=${BAD}/photo_unknown_absorber.yaml)
colchem_cli_test(bad.photo_threshold_unit 4
  "photo_threshold_unit.yaml:30:88: 'channels.8.threshold': expected a wavelength \\('816.9 nm'\\) or an energy .*found unit 'K'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set photolysis.data=${BAD}/photo_threshold_unit.yaml)

# --- Table files (exit 4) -----------------------------------------------------------------
colchem_cli_test(bad.table_negative 4 "table_negative.csv: 'temperature': expected positive values, found -5.000000 in data row 2"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set atmosphere.temperature=${BAD}/table_negative.csv)
colchem_cli_test(bad.table_hot 4 "table_hot.csv: 'temperature': expected temperatures from 1 K to 1e5 K, found 1e\\+06 in data row 3; bounds of physical sense"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set atmosphere.temperature=${BAD}/table_hot.csv)
colchem_cli_test(bad.table_eddy_huge 4
  "table_eddy_huge.csv: 'eddy_diffusion': expected diffusion coefficients of at most 1e12 cm2 s-1, found 1e\\+300 in data row 2"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=atmosphere.eddy_diffusion={table: ${BAD}/table_eddy_huge.csv}")
colchem_cli_test(bad.table_descending 4 "table_descending.csv:5: 'altitude': expected values increasing down the column, found 30 after 70"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set atmosphere.temperature=${BAD}/table_descending.csv)
colchem_cli_test(bad.table_no_column 4 "table_no_column.csv:3: 'header': expected a column named 'temperature', found columns altitude, temp"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set atmosphere.temperature=${BAD}/table_no_column.csv)
colchem_cli_test(bad.table_pressure_unit 4
  "table_pressure_unit.csv:3: 'pressure': expected a unit convertible to 'g cm-1 s-2', found 'K'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml "--set=atmosphere.pressure={table: ${BAD}/table_pressure_unit.csv}")
colchem_cli_test(bad.table_empty 4 "table_empty.csv: expected a header line naming the columns, found an empty file"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set atmosphere.temperature=${BAD}/table_empty.csv)

# --- Observation files through check (exit 4) ---------------------------------------------
colchem_cli_test(bad.obs_no_rows 4 "obs_no_rows.csv:3: expected at least one data row after the header, found none"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set observations=${BAD}/obs_no_rows.csv)
colchem_cli_test(bad.obs_altitude_unit 4 "obs_altitude_unit.csv:3: 'altitude': expected a unit convertible to 'cm', found 'K'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set observations=${BAD}/obs_altitude_unit.csv)

colchem_cli_test(bad.check_observation_species 4
  "obs_unknown_species.csv:4: 'species': expected a species of the model \\(SO2, OH, HSO3\\), found 'XYZ'"
  $<TARGET_FILE:colchem> check ${RCOL} --set observations=${BAD}/obs_unknown_species.csv)

# --- Sweep files (exit 3), before any variant runs -----------------------------------------
set(SWEEP ${CMAKE_CURRENT_LIST_DIR}/sweep/tellin_sweep.yaml)
# An observed species the model lacks: refused before the variants (4), not as each failing.
colchem_cli_test(bad.sweep_observation_species 4
  "obs_unknown_species.csv:4: 'species': expected a species of the model \\(.*\\), found 'XYZ'"
  $<TARGET_FILE:colchem> sweep ${SWEEP} --set sweep.observations=${BAD}/obs_unknown_species.csv -o sweep_obs_species.nc --table sweep_obs_species.csv)
colchem_cli_test(bad.sweep_unknown_parameter 3
  "'parameters.sulfate_removal_scal': expected a parameter of mechanism 'tellin' \\(sulfate_condensation_scale, sulfate_removal_scale\\), found unknown parameter 'sulfate_removal_scal'; did you mean 'sulfate_removal_scale'\\?"
  $<TARGET_FILE:colchem> sweep ${SWEEP} "--set=parameters.sulfate_removal_scal=[1, 2]" -o sweep_unknown_parameter.nc --table sweep_unknown_parameter.csv)
colchem_cli_test(bad.sweep_parameter_range 3
  "'parameters.sulfate_removal_scale': expected values of 'sulfate_removal_scale' within \\[0.25, 4\\], found 100"
  $<TARGET_FILE:colchem> sweep ${SWEEP} "--set=parameters.sulfate_removal_scale=[1, 100]" -o sweep_parameter_range.nc --table sweep_parameter_range.csv)
colchem_cli_test(bad.sweep_log_range_negative 3
  "'parameters.sulfate_removal_scale.log_range.from': expected a positive 'from' for a logarithmic range, found '-0.5'"
  $<TARGET_FILE:colchem> sweep ${SWEEP} "--set=parameters.sulfate_removal_scale={log_range: {from: -0.5, to: 4, count: 3}}" -o sweep_log_range.nc --table sweep_log_range.csv)
colchem_cli_test(bad.sweep_zero_count 3
  "'parameters.sulfate_removal_scale.log_range.count': expected a count from 1 to 100000, found '0'"
  $<TARGET_FILE:colchem> sweep ${SWEEP} "--set=parameters.sulfate_removal_scale={log_range: {from: 0.5, to: 4, count: 0}}" -o sweep_zero_count.nc --table sweep_zero_count.csv)
colchem_cli_test(bad.sweep_missing_scenario 3 "no_such_scenario.yaml: expected a readable YAML file, found no such file or it cannot be read"
  $<TARGET_FILE:colchem> sweep ${SWEEP} --set sweep.scenario=no_such_scenario.yaml -o sweep_missing.nc --table sweep_missing.csv)

# --- Command lines (exit 2) -----------------------------------------------------------------
colchem_cli_test(bad.cli_set_without_value 2 "--set grid.cells: expected KEY.PATH=VALUE, found 'grid.cells'"
  $<TARGET_FILE:colchem> check ${CFG}/tellin.yaml --set grid.cells)
colchem_cli_test(bad.cli_log_level 2 "--log-level: loud not in \\{trace,debug,info,warn,error,off\\}"
  $<TARGET_FILE:colchem> --log-level loud check ${CFG}/tellin.yaml)
colchem_nc_test(bad.cli_fitted_not_number 2 "--fitted-parameters: expected a whole number of at least 0, found 'abc'"
  $<TARGET_FILE:colchem> compare ${NCW}/good.nc ${OBS} -p abc --no-write)
colchem_nc_test(bad.cli_budget_unknown_species 2 "--species: expected a species of the run \\(SO2, OH, HSO3\\), found 'XYZ'"
  $<TARGET_FILE:colchem> budget ${NCW}/good.nc -s XYZ)

# --- Output paths (exit 6), refused before anything is computed --------------------------
colchem_cli_test(bad.output_is_directory 6
  "out_is_dir: '-o/--output': expected the path of an output file, found a directory; name a file in it, such as out_is_dir/out.nc"
  sh -c "mkdir -p out_is_dir && exec $<TARGET_FILE:colchem> run ${RCOL} -o out_is_dir")
colchem_cli_test(bad.output_under_file 6
  "out_plain_file/x.nc: '-o/--output': expected a directory for the output, found 'out_plain_file', which is a file, not a directory"
  sh -c "touch out_plain_file && exec $<TARGET_FILE:colchem> run ${RCOL} -o out_plain_file/x.nc")

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
