# The dependency rules of the source tree (DEVELOPERS.md, "Layers"), checked on the includes.
# Runs at configure time (a broken rule stops the build) and as the CTest test "layout: layer rules":
#   cmake -DSOURCE_DIR=<repository> -P tests/layer_rules.cmake
# Each folder may include only the folders listed for it; a few rules are about names, not folders.
if(NOT SOURCE_DIR)
  set(SOURCE_DIR ${CMAKE_CURRENT_LIST_DIR}/..)
endif()

# folder -> the folders its files may include (its own folder is always allowed).
set(allowed_mesh "")
set(allowed_post "mesh")
set(allowed_solver/core "")
set(allowed_solver/physics "mesh;solver/core")
set(allowed_solver/weldability "solver/core")
set(allowed_solver/numerics "mesh;solver/core;solver/physics")
set(allowed_solver/case "mesh;solver/core;solver/physics;solver/weldability")
set(allowed_solver/studies "mesh;post;solver/core;solver/physics;solver/weldability;solver/numerics;solver/case")
set(allowed_solver/app "mesh;post;solver/core;solver/physics;solver/weldability;solver/numerics;solver/case;solver/studies")
set(layers mesh post solver/core solver/physics solver/weldability solver/numerics solver/case solver/studies solver/app)

set(problems "")
macro(problem text)
  string(APPEND problems "\n  - ${text}")
endmacro()

foreach(layer IN LISTS layers)
  file(GLOB_RECURSE files RELATIVE ${SOURCE_DIR} ${SOURCE_DIR}/${layer}/*.hpp ${SOURCE_DIR}/${layer}/*.cpp)
  foreach(file IN LISTS files)
    file(STRINGS ${SOURCE_DIR}/${file} includes REGEX "^#include \"")
    foreach(line IN LISTS includes)
      string(REGEX REPLACE "^#include \"([^\"]+)\".*" "\\1" target "${line}")
      get_filename_component(folder ${target} DIRECTORY)
      if(folder STREQUAL layer)
        continue()
      endif()
      list(FIND allowed_${layer} "${folder}" found)
      if(found EQUAL -1)
        problem("${file} includes ${target}: ${layer}/ may include only ${layer}/ and [${allowed_${layer}}]")
      endif()
    endforeach()
    # Only the program links the command-line parser and MPI.
    if(NOT layer STREQUAL "solver/app")
      file(STRINGS ${SOURCE_DIR}/${file} outside REGEX "^#include <(CLI/|mpi\\.h)")
      if(outside)
        problem("${file} includes ${outside}: only solver/app/ uses CLI11 and MPI")
      endif()
    endif()
  endforeach()
endforeach()

# forbid_text(FILES REGEX WHY): every line of FILES (relative to SOURCE_DIR) matching REGEX is a problem.
# A function, not a macro: a macro would re-read the regex's backslashes as escapes.
function(forbid_text files regex why)
  foreach(file IN LISTS ${files})
    file(STRINGS ${SOURCE_DIR}/${file} matched REGEX "${regex}")
    if(matched)
      problem("${file}: ${why}: ${matched}")
    endif()
  endforeach()
  set(problems "${problems}" PARENT_SCOPE)
endfunction()

# The time loop reaches the thermal history through its observer interface, never by name.
file(GLOB numerics RELATIVE ${SOURCE_DIR} ${SOURCE_DIR}/solver/numerics/*.hpp ${SOURCE_DIR}/solver/numerics/*.cpp)
forbid_text(numerics "ThermalHistory|SectionHistory"
            "names a thermal history; the time loop knows observers only (StepObserver)")

# The caution texts live in one place (post/cautions.cpp) that the commands and pages include.
file(GLOB_RECURSE sources RELATIVE ${SOURCE_DIR} ${SOURCE_DIR}/solver/*.cpp ${SOURCE_DIR}/post/*.cpp)
list(REMOVE_ITEM sources post/cautions.cpp)
forbid_text(sources "char\\* const [a-z_]*caution|caution[a-z_]* =$|[a-z_]*caution = \""
            "defines a caution text; cautions live in post/cautions.cpp")

# Nothing in the project points at files outside it: every check names its published source itself
# (tests/REFERENCES.md lists them all), never a numbered item of another file.
file(GLOB_RECURSE everything RELATIVE ${SOURCE_DIR} ${SOURCE_DIR}/solver/* ${SOURCE_DIR}/post/* ${SOURCE_DIR}/mesh/*
     ${SOURCE_DIR}/tests/*.cpp ${SOURCE_DIR}/tests/*.hpp ${SOURCE_DIR}/tests/*.py ${SOURCE_DIR}/tests/*.sh
     ${SOURCE_DIR}/tests/analytic/* ${SOURCE_DIR}/cases/*)
forbid_text(everything "\\.\\./shared|REFERENCES|[Cc]heck values? [0-9]" "cites a file outside the repository")

if(problems)
  message(FATAL_ERROR "heatbead layer rules broken:${problems}")
endif()
