# Register layouts (models/layout/) and the TLM-2.0 bus side (models/bus/), built into
# tickbench_models. Included from models/CMakeLists.txt. The layout loader reads its files through
# the TOML reader of tickbench_scenario (sim/toml_reader.h); the link stays private, and so does
# toml++ with it: no public header of these folders includes it. nlohmann-json (the JSON form of a
# layout) is private too.
target_sources(tickbench_models PRIVATE
  ${CMAKE_CURRENT_LIST_DIR}/register_layout.cpp
  ${CMAKE_CURRENT_LIST_DIR}/layout_table.cpp
  ${CMAKE_CURRENT_LIST_DIR}/unmapped_access.cpp
  ${CMAKE_CURRENT_LIST_DIR}/register_file.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../bus/timer_target.cpp
  ${CMAKE_CURRENT_LIST_DIR}/../bus/address_router.cpp
)
target_link_libraries(tickbench_models PRIVATE tickbench::scenario nlohmann_json::nlohmann_json)
