#include "sim/toml_text.h"

#include <algorithm>
#include <sstream>

namespace sim {

std::string got(const toml::node& n) {
    std::ostringstream s;
    switch (n.type()) {
        case toml::node_type::string:
            return in_quotes(n.as_string()->get());
        case toml::node_type::integer:
            return std::to_string(n.as_integer()->get());
        case toml::node_type::boolean:
            return n.as_boolean()->get() ? "true" : "false";
        case toml::node_type::floating_point:
            s << *n.as_floating_point();
            return s.str() + " (a floating-point number)";
        case toml::node_type::array:
            return n.as_array()->empty() ? "an empty array" : "an array";
        case toml::node_type::table:
            return "a table";
        case toml::node_type::date:
            s << *n.as_date();
            return "the date " + s.str();
        case toml::node_type::time:
            s << *n.as_time();
            return "the time of day " + s.str();
        case toml::node_type::date_time:
            s << *n.as_date_time();
            return "the date-time " + s.str();
        case toml::node_type::none:
            break;
    }
    return "nothing";
}

}  // namespace sim
