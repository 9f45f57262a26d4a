# The check engine (sim/checks/) and the report writers (sim/report/): part of tickbench_sim, so
# every program that runs a simulation can check and report. The scenario spellings of check
# values build on the quantity parser and go with the scenario library.
target_sources(tickbench_sim PRIVATE
  ${CMAKE_CURRENT_LIST_DIR}/condition.cpp
  ${CMAKE_CURRENT_LIST_DIR}/check_spec.cpp
  ${CMAKE_CURRENT_LIST_DIR}/check_engine.cpp
  ${CMAKE_CURRENT_LIST_DIR}/detail/check_state.cpp
  ${CMAKE_CURRENT_LIST_DIR}/detail/check_kinds.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../report/checks_jsonl.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../report/junit_xml.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../report/summary_text.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../report/detail/output_file.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../report/wave_recorder.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../report/report_model.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../report/report_html.cpp
)
target_sources(tickbench_scenario PRIVATE
  ${CMAKE_CURRENT_LIST_DIR}/check_spec_text.cpp
)
