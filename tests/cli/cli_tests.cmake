# Command-line behaviour: exit codes and messages for every class of input error, --help on
# every command, and the output opened by real NetCDF clients (ncdump, python3-xarray).
set(EXPECT ${CMAKE_CURRENT_LIST_DIR}/expect.sh)
set(BAD ${CMAKE_CURRENT_LIST_DIR}/bad)
set(CFG ${CMAKE_SOURCE_DIR}/configs)

function(colchem_cli_test name code regex)
  add_test(NAME cli.${name} COMMAND ${EXPECT} ${code} "${regex}" -- ${ARGN})
  set_tests_properties(cli.${name} PROPERTIES WORKING_DIRECTORY ${CMAKE_CURRENT_BINARY_DIR})
endfunction()

colchem_cli_test(version 0 "^colchem [0-9]+\\.[0-9]+\\.[0-9]+" $<TARGET_FILE:colchem> --version)
colchem_cli_test(help 0 "Subcommands:" $<TARGET_FILE:colchem> --help)
colchem_cli_test(help_check 0 "--set" $<TARGET_FILE:colchem> check --help)
colchem_cli_test(help_run 0 "--output" $<TARGET_FILE:colchem> run --help)
colchem_cli_test(no_command 2 "subcommand" $<TARGET_FILE:colchem>)
colchem_cli_test(unknown_option 2 "--bogus" $<TARGET_FILE:colchem> check --bogus ${CFG}/pyrene.yaml)
colchem_cli_test(check_default 0 "grid +54 cells" $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml)
colchem_cli_test(check_misspelt_key 3
  "misspelt_key.yaml:16:3: 'grid.cels': expected a known key in 'grid', found unknown key 'cels'; did you mean 'cells'\\?"
  $<TARGET_FILE:colchem> check ${BAD}/misspelt_key.yaml)
colchem_cli_test(check_bare_number 3
  "bare_number.yaml:[0-9]+:[0-9]+: 'planet.radius': expected a number with a unit, such as '6050 km', found '6050' with no unit"
  $<TARGET_FILE:colchem> check ${BAD}/bare_number.yaml)
colchem_cli_test(check_wrong_unit 3
  "'grid.top': expected a unit convertible to 'cm'.*found 'bar'"
  $<TARGET_FILE:colchem> check ${BAD}/wrong_unit.yaml)
# A unit spelt in the wrong case gets the right spelling suggested (UDUNITS-2 symbols are
# case-sensitive).
colchem_cli_test(check_unit_case 3
  "'planet.star_distance': expected a unit that UDUNITS-2 knows .*found 'AU'.*did you mean 'au'"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene_full.yaml --set "planet.star_distance=1.3 AU")
colchem_cli_test(check_missing_key 3
  "'planet': expected a key 'star_distance' here, found none"
  $<TARGET_FILE:colchem> check ${BAD}/missing_key.yaml)
colchem_cli_test(check_yaml_syntax 3 "syntax.yaml:[0-9]+:[0-9]+: expected valid YAML, found a syntax error"
  $<TARGET_FILE:colchem> check ${BAD}/syntax.yaml)
colchem_cli_test(check_bad_table 4 "bad_row.csv:6: 'temperature': expected a finite number, found 'warm'"
  $<TARGET_FILE:colchem> check ${BAD}/bad_table.yaml)
colchem_cli_test(check_table_range 3
  "'atmosphere.temperature': expected a table covering the grid"
  $<TARGET_FILE:colchem> check ${BAD}/table_range.yaml)
colchem_cli_test(check_bad_choice 3 "expected one of: forbid, hold_ends, found 'hold_end'; did you mean 'hold_ends'\\?"
  $<TARGET_FILE:colchem> check ${BAD}/bad_choice.yaml)
colchem_cli_test(set_override 0 "grid +120 cells"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml --set grid.cells=120)
colchem_cli_test(set_bad_value 3 "--set grid.cells=many: 'grid.cells': expected a whole number, found 'many'"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml --set grid.cells=many)
colchem_cli_test(set_unknown_key 3 "--set grid.cell=5: 'grid.cell': expected a known key in 'grid'.*did you mean 'cells'"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml --set grid.cell=5)
colchem_cli_test(set_malformed 2 "expected KEY.PATH=VALUE"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene.yaml --set grid.cells)
colchem_cli_test(missing_file 2 "File does not exist"
  $<TARGET_FILE:colchem> check ${CFG}/no_such_file.yaml)

# Box mode (README.md, section Configuration reference): help, a run against the analytic equilibrium of
# validation/chem/box_equilibrium (README there), a bad mechanism (exit 4), and the
# chemistry summary of check.
set(CHEMV ${CMAKE_SOURCE_DIR}/validation/chem)
colchem_cli_test(help_box 0 "--set" $<TARGET_FILE:colchem> box --help)
colchem_cli_test(box_equilibrium 0 "ClO +1\\.20177e\\+09"
  $<TARGET_FILE:colchem> box ${CHEMV}/box_equilibrium/box.yaml -o box_equilibrium.nc)
colchem_cli_test(box_ncdump 0 "number_density:units = \"cm-3\".*reaction_rate:units = \"cm-3 s-1\""
  sh -c "$<TARGET_FILE:colchem> box ${CHEMV}/box_equilibrium/box.yaml -o box_nc.nc >/dev/null 2>&1 && ncdump -h box_nc.nc | tr '\\n' ' '")
colchem_cli_test(box_bad_mechanism 4
  "unbalanced.yaml:14:19: 'modules.0.reactions.1.equation': expected a reaction balanced in every element.*'ClONO2 -> ClO' changing N -1, O -2"
  $<TARGET_FILE:colchem> box ${CMAKE_SOURCE_DIR}/tests/chem/bad/box_unbalanced.yaml)
colchem_cli_test(box_bad_parameter 3 "chemistry.modules.0': expected a module of mechanism 'clo-dimer', found unknown module 'dimmer'; did you mean 'dimer'"
  $<TARGET_FILE:colchem> box ${CHEMV}/box_equilibrium/box.yaml --set chemistry.modules=[dimmer])
# scenario_soh.yaml has a mechanism with photolysis channels and no photolysis section: check
# prints its chemistry summary and then refuses it (exit 3), as run does.
colchem_cli_test(check_chemistry 3 "50 of 52 active reactions balanced in every element; 2 sinks"
  $<TARGET_FILE:colchem> check ${CMAKE_SOURCE_DIR}/tests/chem/scenario_soh.yaml)
colchem_cli_test(check_chemistry_verbose 3 "hso3_m +HSO3 \\+ M -> OH \\+ SO2 \\+ M +equilibrium_reverse"
  $<TARGET_FILE:colchem> check -v ${CMAKE_SOURCE_DIR}/tests/chem/scenario_soh.yaml)
colchem_cli_test(check_chemistry_no_photolysis 3
  "'photolysis': expected a photolysis section \\(the mechanism has photolysis channel 'O2'\\), found none"
  $<TARGET_FILE:colchem> check ${CMAKE_SOURCE_DIR}/tests/chem/scenario_soh.yaml)

# The output read by real clients: ncdump (netcdf-bin) and xarray (python3-xarray, run on
# Debian's own interpreter so that its python3-* packages are the ones imported).
add_test(NAME cli.output_clients
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/output_clients.sh $<TARGET_FILE:colchem> ${CFG}/pyrene.yaml)
set_tests_properties(cli.output_clients PROPERTIES WORKING_DIRECTORY ${CMAKE_CURRENT_BINARY_DIR})
# The run, sweep, box and photo files read by ncdump, ncks (nco), cdo and xarray.
add_test(NAME cli.ecosystem_read
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/ecosystem_read_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/ecosystem_read)

# Validation cases rerun as tests (validation/*/*/run.sh take the colchem executable).
add_test(NAME validation.background.ussa76
  COMMAND ${CMAKE_SOURCE_DIR}/validation/background/ussa76/run.sh $<TARGET_FILE:colchem>)
set_tests_properties(validation.background.ussa76 PROPERTIES
  ENVIRONMENT "OUT=${CMAKE_CURRENT_BINARY_DIR}/validation_ussa76.nc")

# The plotting script on small files in colchem's layouts (python3-matplotlib, python3-netcdf4).
add_test(NAME cli.plot_profiles
  COMMAND /usr/bin/python3 ${CMAKE_CURRENT_LIST_DIR}/plot_test.py ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/plots)
colchem_cli_test(help_compare 0 "--fitted-parameters" $<TARGET_FILE:colchem> compare --help)
colchem_cli_test(help_budget 0 "--bands" $<TARGET_FILE:colchem> budget --help)

# Rate constants printed for kineticists, against JPL 19-5 k(298 K) and the rate-law formulas
# (tests/cli/rates_test.py names each source).
add_test(NAME cli.rates
  COMMAND /usr/bin/python3 ${CMAKE_CURRENT_LIST_DIR}/rates_test.py $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR})
colchem_cli_test(help_rates 0 "--temperature" $<TARGET_FILE:colchem> rates --help)

# The whole-run switch for molecular diffusion against the per-species one.
add_test(NAME cli.molecular_switch
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/molecular_switch_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/molecular_switch)

# Prescribed photolysis rates: a computed profile prescribed gives the same state; a held
# value appears exactly in the J output; the steady progress line shows the ceiling; an
# unknown observation column is warned about.
add_test(NAME cli.prescribed_j
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/prescribed_j_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/prescribed_j)
# Sweeps on one and two MPI ranks; a failing variant.
add_test(NAME cli.sweep
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/sweep_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_CURRENT_LIST_DIR}/sweep ${CMAKE_CURRENT_BINARY_DIR}/sweep_work)
add_test(NAME cli.sweep_signal
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/sweep_signal_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_CURRENT_LIST_DIR}/sweep ${CMAKE_CURRENT_BINARY_DIR}/sweep_signal_work)
# Batch-safe sweeps (issue 17): resume after SIGTERM; dry run, stored overrides and
# duplicates; job-array pieces merged against one 2-rank mpirun.
add_test(NAME cli.sweep_resume
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/sweep_resume_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_CURRENT_LIST_DIR}/sweep ${CMAKE_CURRENT_BINARY_DIR}/sweep_resume_work)
add_test(NAME cli.sweep_tools
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/sweep_tools_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_CURRENT_LIST_DIR}/sweep ${CFG} ${CMAKE_CURRENT_BINARY_DIR}/sweep_tools_work)
add_test(NAME cli.sweep_pieces
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/sweep_pieces_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_CURRENT_LIST_DIR}/sweep ${CMAKE_CURRENT_BINARY_DIR}/sweep_pieces_work)
add_test(NAME cli.output_safety
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/output_safety_test.sh $<TARGET_FILE:colchem> ${CFG}
          ${CMAKE_CURRENT_LIST_DIR}/sweep ${CMAKE_CURRENT_BINARY_DIR}/output_safety_work)
colchem_cli_test(help_sweep 0 "mpirun" $<TARGET_FILE:colchem> sweep --help)

# colchem run / budget / compare / restart / interrupt on the Tellin scenario.
add_test(NAME cli.run_tellin
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/run_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/run_work)
# Exact restarts from checkpoints (an invented six-cell column; a few seconds).
add_test(NAME cli.restart
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/restart_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/restart_work)
colchem_cli_test(help_photo 0 "--spectrum" $<TARGET_FILE:colchem> photo --help)
colchem_cli_test(photo_tellin 0 "O3_O2_O1D" $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml)
colchem_cli_test(photo_two_stream 0 "enhancement of J over the direct beam"
  $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml
  --set "photolysis.radiative_transfer={scheme: two_stream, surface_albedo: 0.3}")
# Named parameters on photolysis data: --set equals editing the data; an unused one refused.
add_test(NAME cli.photo_parameter
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/photo_parameter_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/photo_parameter_work)
colchem_cli_test(photo_parameter_unused 4
  "pyrene.yaml:[0-9]+:[0-9]+: 'parameters.overtone_threshold_kcal'.*used by nothing"
  $<TARGET_FILE:colchem> photo ${CFG}/pyrene_full.yaml
  --set photolysis.data=${CFG}/photolysis/tellin_photo.yaml)
colchem_cli_test(photo_parameter_unused_extended 4
  "pyrene_extended.yaml:[0-9]+:[0-9]+: 'parameters.overtone_threshold_kcal'.*used by nothing"
  $<TARGET_FILE:colchem> photo ${CFG}/pyrene_extended.yaml
  --set photolysis.data=${CFG}/photolysis/tellin_photo.yaml)
colchem_cli_test(photo_two_stream_bad 3 "no two-stream settings with 'scheme: direct_beam'"
  $<TARGET_FILE:colchem> photo ${CFG}/tellin.yaml
  --set "photolysis.radiative_transfer={scheme: direct_beam, closure: eddington}")
colchem_cli_test(run_unknown_species 3 "'species.SO3x': expected a species of the mechanism"
  $<TARGET_FILE:colchem> run ${CFG}/tellin.yaml --set species.SO3x.initial=1e-9)
add_test(NAME cli.labcell
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/labcell_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/labcell_work)

# The Tellin SO2 injection (validation/worlds/tellin_injection/README.md): by default the
# short case (15 cells, injection on day 1, end on day 8; about 12 s) against its recorded
# e-folding time to 2 %; label slow, the reduced case (25 cells, 70 days; about a minute)
# against the recorded converged e-folding time to 10 %, and the full 130-day case, which
# also shows the reduced case within 5 % and the short case within 15 % of the full one.
add_test(NAME validation.worlds.tellin_injection_short
  COMMAND ${CMAKE_SOURCE_DIR}/validation/worlds/tellin_injection/short.sh $<TARGET_FILE:colchem>)
set_tests_properties(validation.worlds.tellin_injection_short PROPERTIES
  ENVIRONMENT "OUT=${CMAKE_CURRENT_BINARY_DIR}/validation_tellin_injection_short.nc")
add_test(NAME validation.worlds.tellin_injection_reduced
  COMMAND ${CMAKE_SOURCE_DIR}/validation/worlds/tellin_injection/reduced.sh $<TARGET_FILE:colchem>)
set_tests_properties(validation.worlds.tellin_injection_reduced PROPERTIES LABELS slow
  ENVIRONMENT "OUT=${CMAKE_CURRENT_BINARY_DIR}/validation_tellin_injection_reduced.nc")
add_test(NAME validation.worlds.tellin_injection
  COMMAND ${CMAKE_SOURCE_DIR}/validation/worlds/tellin_injection/run.sh $<TARGET_FILE:colchem>)
set_tests_properties(validation.worlds.tellin_injection PROPERTIES TIMEOUT 2400 LABELS slow
  ENVIRONMENT "OUT=${CMAKE_CURRENT_BINARY_DIR}/validation_tellin_injection.nc")

# The cold thin world of validation/solve/thin_world_convergence loads and converges on its
# own 70-cell grid (about 1 s; the grid series is the validation script).
colchem_cli_test(run_frigid_thin 0 "frigid_thin: steady converged"
  $<TARGET_FILE:colchem> run ${CFG}/frigid_thin.yaml -o frigid_thin_70.nc)
# colchem resolve: Richardson over grid families and equidistributed grids on the
# closed-form thin boundary layer (a few seconds).
colchem_cli_test(help_resolve 0 "--equidistribute" $<TARGET_FILE:colchem> resolve --help)
colchem_cli_test(resolve_no_chemistry 3 "'chemistry': expected a chemistry section"
  $<TARGET_FILE:colchem> resolve ${CFG}/pyrene.yaml -o resolve_no_chemistry.nc)
colchem_cli_test(resolve_two_levels 2 "--levels"
  $<TARGET_FILE:colchem> resolve ${CFG}/tellin.yaml --levels 2)
add_test(NAME cli.resolve
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/resolve_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/resolve_work)
# Pyrene cloud-top J-values with the two-stream scheme over an invented reflecting deck
# against the direct beam (a Pyrene steady solve first; a few seconds).
add_test(NAME validation.photo.pyrene_cloud_deck
  COMMAND ${CMAKE_SOURCE_DIR}/validation/photo/pyrene_cloud_deck/run ${CMAKE_BINARY_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/pyrene_deck_work)
# Pyrene converges at 54 and 108 cells from the cold start, with a quadratic end phase
# (Newton-Krylov with the photolysis coupling), also with the two-stream scheme at 108 cells
# (about 15 s).
add_test(NAME cli.pyrene_newton
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/pyrene_newton_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/pyrene_newton_work)
# The 108-cell two-stream solve under OpenBLAS and the default BLAS (issue 10): both converge
# to the same state; skipped (exit 77) where OpenBLAS is not installed.
add_test(NAME cli.pyrene_blas
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/pyrene_blas_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/pyrene_blas_work)
set_tests_properties(cli.pyrene_blas PROPERTIES SKIP_RETURN_CODE 77)

# Condensation and held profiles (README.md, sections Condensation and species keys). The
# Pyrene base state with its invented haze: the cloud-deck cells, where uptake on the
# droplets takes seconds (1/k = 4 / (vbar A) ~ 20 s), hold the vapour within 10x of
# saturation (analytic: n/n_sat - 1 = net production / (k n_sat), small there); the
# summary counts them among the 42 cells below 100 km that have droplets (input profile).
add_test(NAME validation.chem.condensed_exchange
  COMMAND ${CMAKE_SOURCE_DIR}/validation/chem/condensed_exchange/run.sh $<TARGET_FILE:colchem>)
set_tests_properties(validation.chem.condensed_exchange PROPERTIES
  ENVIRONMENT "OUT=${CMAKE_CURRENT_BINARY_DIR}/validation_condensed_exchange.nc")
colchem_cli_test(pyrene_condensation 0
  "H2SO4 -> \\(condensed phase\\): vapour at most 10x saturation in [1-9][0-9]* of 42 cells with condensed phase"
  $<TARGET_FILE:colchem> run ${CFG}/pyrene_full.yaml -o pyrene_condensation.nc)
# A held profile: H2O held at 3 ppm over 80-100 km by relaxation (timescale 100 s) stays
# within 1 % of it (common practice, no source: tau much shorter than the chemical and
# transport lifetimes), and the budget lists the supply that holds it.
colchem_cli_test(held_profile 0
  "H2O -> \\(held-profile supply\\): largest relative departure from the held profile [0-9.]+e-0[3-9].*H2O: column production.*H2O -> \\(held-profile supply\\)"
  sh -c "($<TARGET_FILE:colchem> run ${CFG}/pyrene_full.yaml -o held_profile.nc --set 'species.H2O.hold={mixing_ratio: 3 ppm, from: 80 km, to: 100 km}' && $<TARGET_FILE:colchem> budget held_profile.nc -s H2O) 2>&1 | tr '\\n' ' '")
colchem_cli_test(held_profile_bad_range 3 "'species.H2O.hold.to': expected a top above 'from', found '70 km'"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene_full.yaml --set "species.H2O.hold={mixing_ratio: 3 ppm, from: 80 km, to: 70 km}")
colchem_cli_test(condensation_bad_weight 3 "weight_fraction': expected an acid weight fraction from 0.4 to 1"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene_full.yaml --set chemistry.condensation.0.saturation.h2so4_aqueous.weight_fraction=0.3)
colchem_cli_test(condensation_fixed_species 3 "condensation.0.species': expected a species that is not held fixed, found 'CO2'"
  $<TARGET_FILE:colchem> check ${CFG}/pyrene_full.yaml --set chemistry.condensation.0.species=CO2)

# colchem ensemble on a closed-form linear column: percentiles against the analytic ones,
# 1 and 2 ranks identical, the 95 % band test.
add_test(NAME cli.ensemble
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/ensemble_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/ensemble_work)
# Members of the real Pyrene network converge: at most 3 failed members of a seeded 12
# (6 before the fixes of issue 15, 2 now).
add_test(NAME cli.ensemble_pyrene
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/ensemble_pyrene_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/ensemble_pyrene_work)
colchem_cli_test(help_ensemble 0 "latin_hypercube" $<TARGET_FILE:colchem> ensemble --help)
# First-order variance attribution against the closed form and the ensemble, and flagged
# where it is not valid.
add_test(NAME cli.ensemble_attribution
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/attribution_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/attribution_work)
# The ensemble plots from a small real Pyrene run: PNGs written, numbers drawn from the file.
add_test(NAME cli.plot_ensemble
  COMMAND /usr/bin/python3 ${CMAKE_CURRENT_LIST_DIR}/plot_ensemble_test.py $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/plot_ensemble)
# The Python package python/colchem_py on real run, sweep, box, photo, sensitivity and
# ensemble files: names as coordinates, pint units (nmol/mol), every plot drawn from the file.
add_test(NAME cli.python_package
  COMMAND /usr/bin/python3 ${CMAKE_CURRENT_LIST_DIR}/python_package_test.py $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/python_package)
colchem_cli_test(ensemble_attribute_bad 2 "--attribute': expected SPECIES@KM"
  $<TARGET_FILE:colchem> ensemble ${CMAKE_CURRENT_LIST_DIR}/ensemble/linear_loss.yaml --attribute SO@900)

# H2SO4 vapour over the haze in the shipped Pyrene base state (pyrene_full.yaml as shipped):
# the run file's exchange variables against the kinetic uptake law, the closed-form local
# balance n - n_sat = supply / k, and vapour within 10x of saturation wherever that balance
# allows it and in the cloud deck (tests/cli/acid_vapour_test.py says why not above).
add_test(NAME cli.pyrene_acid_vapour
  COMMAND sh -c "'$<TARGET_FILE:colchem>' --log-level warn run '${CFG}/pyrene_full.yaml' -o pyrene_acid_vapour.nc && /usr/bin/python3 '${CMAKE_CURRENT_LIST_DIR}/acid_vapour_test.py' pyrene_acid_vapour.nc '${CMAKE_SOURCE_DIR}/profiles/pyrene_condensed_acid.csv'")
set_tests_properties(cli.pyrene_acid_vapour PROPERTIES WORKING_DIRECTORY ${CMAKE_CURRENT_BINARY_DIR})
# The same on the demo's base state (pyrene_extended.yaml at the demo grid, 108 cells): the
# kinetic law and the closed-form balance are asserted; vapour within 10x of saturation is
# asserted only where the balance allows it (the deck at 61-64 km is 28-400x, printed; README
# "Results on Pyrene", The vapour the candidates act on).
add_test(NAME cli.pyrene_extended_acid_vapour
  COMMAND sh -c "'$<TARGET_FILE:colchem>' --log-level warn run '${CFG}/pyrene_extended.yaml' --set grid.cells=108 -o pyrene_extended_acid_vapour.nc && /usr/bin/python3 '${CMAKE_CURRENT_LIST_DIR}/acid_vapour_test.py' pyrene_extended_acid_vapour.nc '${CMAKE_SOURCE_DIR}/profiles/pyrene_haze_evaporating.csv' --no-deck")
set_tests_properties(cli.pyrene_extended_acid_vapour PROPERTIES WORKING_DIRECTORY ${CMAKE_CURRENT_BINARY_DIR})
# The extended Pyrene network converges at 54, 108 and 216 cells, resolved between 108 and
# 216, S8 held at its vapour pressure by the haze, budgets closed (about 10 s).
add_test(NAME cli.pyrene_extended
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/pyrene_extended_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/pyrene_extended_work)
# The per-miss explanations of the published ranges (scripts/published_ranges.py --explain)
# on a 108-cell base run: shares, budgets and the SO/SO2 equilibrium ratio consistent with the
# run file (about 5 s).
add_test(NAME cli.published_ranges
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/published_ranges_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/published_ranges_work)
# Adjoint sensitivities (README.md, section Sensitivities): finite-difference checks on
# Pyrene and Tellin for three kinds of objective, the file's consistency, --help and bad
# inputs.
# One CTest test per case (they are independent; CTest runs them in parallel).
foreach(case pyrene_chi2 pyrene_column pyrene_photo_parameters tellin_aerosol tellin_so2 tellin_rate)
  add_test(NAME cli.sensitivity.${case}
    COMMAND ${CMAKE_CURRENT_LIST_DIR}/sensitivity_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
            ${CMAKE_CURRENT_BINARY_DIR}/sensitivity_work/${case} ${case})
  set_tests_properties(cli.sensitivity.${case} PROPERTIES TIMEOUT 900)
endforeach()
colchem_cli_test(help_sensitivity 0 "--objective.*--check"
  sh -c "$<TARGET_FILE:colchem> sensitivity --help | tr '\\n' ' '")
colchem_cli_test(sensitivity_unknown_species 2
  "pyrene_full.yaml: '--species': expected a species of the model \\(.*SO2.*\\), found 'SO3X'"
  $<TARGET_FILE:colchem> sensitivity ${CFG}/pyrene_full.yaml --objective column --species SO3X)
colchem_cli_test(sensitivity_held_species 2
  "'--species': expected a species that is not held fixed, found 'CO2' \\(held\\)"
  $<TARGET_FILE:colchem> sensitivity ${CFG}/pyrene_full.yaml --objective column --species CO2)
colchem_cli_test(sensitivity_altitude_outside 2
  "'--altitude': expected an altitude within the cell centres, 58.5-111.5 km, found '150 km'"
  $<TARGET_FILE:colchem> sensitivity ${CFG}/pyrene_full.yaml --objective mole_fraction --species SO2 --altitude 150)
colchem_cli_test(sensitivity_unknown_reaction 2
  "'--reaction': expected an active reaction: its id in the mechanism file .*found no reaction with id or equation 'k9999'"
  $<TARGET_FILE:colchem> sensitivity ${CFG}/pyrene_full.yaml --objective rate --reaction k9999)
colchem_cli_test(sensitivity_no_observations 2
  "'--observations': expected an observation file .*found none"
  $<TARGET_FILE:colchem> sensitivity ${CFG}/pyrene_full.yaml)
colchem_cli_test(sensitivity_transient 3
  "tellin.yaml: 'solver.method': expected steady .*found 'transient'"
  $<TARGET_FILE:colchem> sensitivity ${CFG}/tellin.yaml --objective column --species SO2)
colchem_cli_test(sensitivity_bad_objective 2 "--objective"
  $<TARGET_FILE:colchem> sensitivity ${CFG}/pyrene_full.yaml --objective flux)
add_test(NAME validation.solve.adjoint_linear_column
  COMMAND ${CMAKE_SOURCE_DIR}/validation/solve/adjoint_linear_column/run.sh $<TARGET_FILE:colchem>
          ${CMAKE_CURRENT_BINARY_DIR}/adjoint_linear_column_work)

include(${CMAKE_CURRENT_LIST_DIR}/bad_inputs.cmake)
# Fits (README.md, section Fits): the chi-square gradient of the forward-sensitivity
# Jacobian against finite differences of the full steady solve, and a seeded twin
# experiment on the closed-form linear column (tests/cli/fit_test.sh); --help; bad specs.
# One CTest test per part (independent; CTest runs them in parallel).
foreach(part linear_check pyrene_check twin)
  add_test(NAME cli.fit.${part}
    COMMAND ${CMAKE_CURRENT_LIST_DIR}/fit_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
            ${CMAKE_CURRENT_BINARY_DIR}/fit_work/${part} ${part})
endforeach()
# The comparison of module sets (fit --module-set) in a twin experiment with two candidate
# sources of different shape, on one rank and on two; the fit of a held profile's multiplier
# (tests/cli/fit_compare_test.sh).
add_test(NAME cli.fit_compare
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/fit_compare_test.sh $<TARGET_FILE:colchem> ${CMAKE_SOURCE_DIR}
          ${CMAKE_CURRENT_BINARY_DIR}/fit_compare_work)
colchem_cli_test(help_fit 0 "PATH:MIN:MAX:log, PATH one of chemistry.parameters.NAME" $<TARGET_FILE:colchem> fit --help)
set(LINEAR ${CMAKE_SOURCE_DIR}/tests/cli/ensemble/linear_loss.yaml)
colchem_cli_test(fit_unknown_path 2
  "linear_loss.yaml: '--param': expected PATH:MIN:MAX.*found 'chemistry.rates.k1:0.1:10'"
  $<TARGET_FILE:colchem> fit ${LINEAR} --param chemistry.rates.k1:0.1:10)
colchem_cli_test(fit_unknown_parameter 2
  "'--param': expected a named parameter of the mechanism \\(kscale\\), found 'chemistry.parameters.kscal:0.1:10'"
  $<TARGET_FILE:colchem> fit ${LINEAR} --param chemistry.parameters.kscal:0.1:10)
colchem_cli_test(fit_wrong_boundary_kind 2
  "expected the bottom boundary of SO as it is set in the scenario: species.SO.bottom.mixing_ratio, found 'species.SO.bottom.flux:1:10'"
  $<TARGET_FILE:colchem> fit ${LINEAR} --param species.SO.bottom.flux:1:10)
colchem_cli_test(fit_log_negative_min 2 "expected MIN > 0 for a log parameter"
  $<TARGET_FILE:colchem> fit ${LINEAR} --param chemistry.parameters.kscale:-1:10:log)
colchem_cli_test(fit_start_outside 2 "expected bounds that hold the starting value 1"
  $<TARGET_FILE:colchem> fit ${LINEAR} --param chemistry.parameters.kscale:2:10)
colchem_cli_test(fit_no_held_profile 2
  "'--param': expected a species with a held profile \\(species.NAME.hold in the scenario\\) in species.NAME.hold, found 'species.SO.hold:0.1:10'"
  $<TARGET_FILE:colchem> fit ${LINEAR} --param species.SO.hold:0.1:10)
colchem_cli_test(fit_bad_band 2 "expected atmosphere.eddy_diffusion\\[LO-HI\\] \\(km\\) holding at least one cell edge"
  $<TARGET_FILE:colchem> fit ${LINEAR} --param "atmosphere.eddy_diffusion[70-80]:0.1:10")

# The demo's scenario (configs/pyrene_extended.yaml on its 54-cell grid, base network and all
# candidate modules) against the stored reference run tests/cli/reference/pyrene_demo_54.csv,
# to the solver's step tolerance (tests/cli/demo_reference.py says why).
add_test(NAME cli.demo_reference
  COMMAND /usr/bin/python3 ${CMAKE_CURRENT_LIST_DIR}/demo_reference.py $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/demo_reference_work)

# The README's results table against the demo's sweep run by the current code
# (tests/cli/readme_results_test.sh, scripts/results_table.py --check-readme).
add_test(NAME cli.readme_results
  COMMAND ${CMAKE_CURRENT_LIST_DIR}/readme_results_test.sh $<TARGET_FILE:colchem>
          ${CMAKE_SOURCE_DIR} ${CMAKE_CURRENT_BINARY_DIR}/readme_results_work)

# Order of the default run (`ctest -j2 -LE slow` on the 2-core machines): the longest tests
# start first, so that the run does not end on one long test running alone. CTest orders by
# COST when the build has no timing data yet (a fresh clone); the figures are wall seconds of
# each test in one `ctest -j2` run on a loaded machine divided by 7, that run's ratio to a
# quiet machine's figures (only their order matters). No test asks for two CTest
# processors (PROCESSORS 2), although the sweep, ensemble and fit tests start 2-rank mpiruns
# and cli.sweep_signal three sweeps side by side: under -j2 such a test starts only when both
# slots are free at once, which is at the end of the run, where the six of them ran one
# after another with nothing beside them (a quarter of the run's wall time); as one-slot
# tests their 2-rank stages share the cores with whatever runs beside them.
foreach(entry cli.sweep_signal=26 cli.python_package=17 cli.fit.pyrene_check=17
              cli.sensitivity.pyrene_chi2=14 cli.sensitivity.pyrene_column=14
              cli.sweep_resume=13 validation.worlds.tellin_injection_short=11
              cli.plot_ensemble=8 cli.ensemble_pyrene=8 cli.sensitivity.pyrene_photo_parameters=7
              cli.pyrene_newton=7 cli.fit.twin=6 cli.sensitivity.tellin_aerosol=6
              cli.sweep_pieces=4 cli.sweep_tools=4 cli.ecosystem_read=4 cli.pyrene_blas=3
              cli.sensitivity.tellin_so2=3 cli.plot_profiles=3 cli.sensitivity.tellin_rate=2
              cli.readme_results=2 cli.fit_compare=2 cli.run_tellin=2 cli.sweep=2
              cli.pyrene_extended=2 cli.bad.huge_value=2 cli.ensemble_attribution=2
              unit.transport.test_transport_steady=2 cli.output_safety=2)
  string(REPLACE "=" ";" pair "${entry}")
  list(GET pair 0 name)
  list(GET pair 1 cost)
  set_tests_properties(${name} PROPERTIES COST ${cost})
endforeach()
