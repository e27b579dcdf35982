// The constituent file (JSON, our format; see server/FORMATS.md "Tide
// constituents"): datum, mean level with rate and epoch, and per constituent
// amplitude and Greenwich phase lag; the harmonic analysis adds standard
// errors, resolvability, the residual standard deviation and record details.
#pragma once

#include <istream>
#include <string>

#include <nlohmann/json.hpp>

#include "corrections/tide/constituent_set.h"

namespace strandline::tide {

// Throws InputError naming `file` and the JSON pointer of the offending entry
// (unknown constituent, missing field, wrong type, non-finite number, negative
// amplitude, duplicate name, unknown key).
ConstituentSet parse_constituent_json(const nlohmann::json& document, const std::string& file);
ConstituentSet read_constituent_file(std::istream& in, const std::string& file);
ConstituentSet read_constituent_file(const std::string& path);

// Keys in reading order (name first); parse_constituent_json reads it back.
nlohmann::ordered_json constituent_json(const ConstituentSet& set);
// Writes the JSON (indented) to `path`; throws InputError when it cannot be written.
void write_constituent_file(const ConstituentSet& set, const std::string& path);

}  // namespace strandline::tide
