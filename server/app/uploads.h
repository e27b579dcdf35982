// An upload from body to store: parse the body and apply the input rules
// (upload_rows.h), check new observations against the images already stored,
// then store the rows in one transaction. The HTTP face parses the request and
// renders what comes back (or the exceptions below) as its replies.
#pragma once

#include <cstdint>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

#include "corrections/core/sensor_table.h"
#include "server/io/tabular_body.h"
#include "server/store/store.h"

namespace strandline::app {

enum class OnInvalid { reject, skip };

struct UploadRequest {
  std::string_view body;
  BodyFormat format = BodyFormat::csv;
  OnInvalid on_invalid = OnInvalid::reject;
  store::UploadMeta meta;  // content type, body hash, uploader (received/rejected are filled in)
};

struct UploadReport {
  store::UploadResult result;
  std::vector<std::string> ignored_columns;  // extra columns left out by the column rule
};

// Invalid rows with OnInvalid::reject: nothing was stored.
class InvalidRows : public std::runtime_error {
 public:
  InvalidRows(std::vector<store::RowIssue> issues, std::int64_t received_rows)
      : std::runtime_error(std::to_string(issues.size()) + " of " + std::to_string(received_rows) +
                           " rows are invalid; nothing was stored"),
        rows(std::move(issues)),
        received(received_rows) {}
  std::vector<store::RowIssue> rows;
  std::int64_t received;
};

// Each throws InvalidRows, InputError (a whole body refused: header, JSON
// shape — BodyError —, a whole-record rule) or store::ConflictError.
UploadReport upload_observations(store::Store& store, const std::string& site_id, UploadRequest request,
                                 const SensorTable& sensors);
UploadReport upload_water_levels(store::Store& store, const std::string& site_id, UploadRequest request);
UploadReport upload_waves(store::Store& store, const std::string& site_id, UploadRequest request);
UploadReport upload_slopes(store::Store& store, const std::string& site_id, UploadRequest request);

// A whole tide-constituent file, checked by the tide reader (the batch's
// --tide-constituents rules), stored by content hash. Throws InputError.
store::UploadResult upload_tide_constituents(store::Store& store, const std::string& site_id,
                                             const std::string& body, store::UploadMeta meta);

}  // namespace strandline::app
