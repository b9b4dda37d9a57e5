# cmake -DRESULTS=dir [-DTIME=auto|cpu|real] [-DCOUNTERS=ON] -P bench/ratios.cmake
# Prints "run_name time_per_iteration unit" for every repetition in the Google
# Benchmark JSON files of RESULTS; bench/run.sh turns them into ratios.
#
# run_name is the registered name ("<pair>/<variant>") without the suffixes
# Google Benchmark appends for run options (/iterations:N, /repeats:N,
# /min_time:X, /min_warmup_time:X, /real_time, /manual_time, /process_time),
# so that a pair still matches when one side fixes its iterations; /threads:N
# is kept. Runs that reported an error are left out.
#
# TIME: which time (default auto):
#   auto  real (wall) time for runs measured on it (UseRealTime/UseManualTime)
#         or with several threads, else CPU time, which a busy machine disturbs less;
#   cpu   always CPU time;  real  always real time.
# COUNTERS=ON: after the time, each user counter as name=value (the run's
# own counters, not items_per_second and the like); run.sh ignores them in the
# ratio table and lists them separately.
cmake_minimum_required(VERSION 3.19)  # string(JSON)
if(NOT DEFINED TIME)
  set(TIME auto)
endif()
if(NOT TIME MATCHES "^(auto|cpu|real)$")
  message(FATAL_ERROR "ratios.cmake: TIME = ${TIME} is invalid; expected auto, cpu or real")
endif()
set(standard_keys name family_index per_family_instance_index run_name run_type repetitions repetition_index
    threads iterations real_time cpu_time time_unit aggregate_name aggregate_unit error_occurred error_message
    label items_per_second bytes_per_second)
file(GLOB files ${RESULTS}/*.json)
foreach(f IN LISTS files)
  file(READ ${f} json)
  string(JSON n ERROR_VARIABLE err LENGTH "${json}" benchmarks)
  if(err OR n EQUAL 0)
    continue()
  endif()
  math(EXPR last "${n} - 1")
  foreach(i RANGE ${last})
    string(JSON type GET "${json}" benchmarks ${i} run_type)
    if(NOT type STREQUAL "iteration")
      continue()
    endif()
    string(JSON failed ERROR_VARIABLE err GET "${json}" benchmarks ${i} error_occurred)
    if(NOT err AND failed)
      continue()
    endif()
    string(JSON run GET "${json}" benchmarks ${i} run_name)
    string(JSON threads GET "${json}" benchmarks ${i} threads)
    set(wall_clocked OFF)
    if(run MATCHES "/(real_time|manual_time)(/|$)" OR threads GREATER 1)
      set(wall_clocked ON)
    endif()
    string(REGEX REPLACE "/(iterations|repeats|min_time|min_warmup_time):[^/]*" "" run "${run}")
    string(REGEX REPLACE "/(real_time|manual_time|process_time)(/|$)" "\\2" run "${run}")
    string(REGEX REPLACE "/$" "" run "${run}")
    if(TIME STREQUAL "real" OR (TIME STREQUAL "auto" AND wall_clocked))
      string(JSON t GET "${json}" benchmarks ${i} real_time)
    else()
      string(JSON t GET "${json}" benchmarks ${i} cpu_time)
    endif()
    string(JSON unit GET "${json}" benchmarks ${i} time_unit)
    set(extra "")
    if(COUNTERS)
      string(JSON keys LENGTH "${json}" benchmarks ${i})
      math(EXPR klast "${keys} - 1")
      foreach(k RANGE ${klast})
        string(JSON key MEMBER "${json}" benchmarks ${i} ${k})
        if(NOT key IN_LIST standard_keys)
          string(JSON v GET "${json}" benchmarks ${i} ${key})
          string(APPEND extra " ${key}=${v}")
        endif()
      endforeach()
    endif()
    message("${run} ${t} ${unit}${extra}")
  endforeach()
endforeach()
