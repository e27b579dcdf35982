// The media type of an upload body (the body itself is read by
// server/io/tabular_body.h, below the HTTP face).
#pragma once

#include <string_view>

#include "server/io/tabular_body.h"

namespace strandline::http {

using strandline::BodyFormat;

// 415 Problem unless the media type is text/csv or application/json.
BodyFormat body_format_of(std::string_view content_type);

}  // namespace strandline::http
