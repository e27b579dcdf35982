// The OpenAPI 3.0 description of the service, served at /v1/openapi.json.
// Written by hand, operation by operation; a test checks that every route the
// router serves appears in it.
#pragma once

#include <nlohmann/json.hpp>

namespace strandline::http {

const nlohmann::json& openapi_document();

}  // namespace strandline::http
