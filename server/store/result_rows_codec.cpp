#include "server/store/result_rows_codec.h"

#include <bit>
#include <cstdint>
#include <cstring>

#include "corrections/core/time_utc.h"
#include "server/store/store_error.h"

namespace strandline::store {

namespace {

static_assert(std::endian::native == std::endian::little, "the stored rows are little-endian");
constexpr std::string_view kMagic = "SLR2";
constexpr std::string_view kMagicV1 = "SLR1";  // before the sensor-offset columns; still read

// The real columns in stored order (a new column means a new magic): SLR1's, then SLR2's.
constexpr double CleanedRow::*kReals[] = {
    &CleanedRow::chainage_raw_m, &CleanedRow::water_level_m,  &CleanedRow::setup_m,
    &CleanedRow::runup_m,        &CleanedRow::wave_level_m,   &CleanedRow::z_ref_m,
    &CleanedRow::slope,          &CleanedRow::correction_m,   &CleanedRow::chainage_m,
    &CleanedRow::sigma_m,        &CleanedRow::sigma_sensor_m, &CleanedRow::sigma_water_level_m,
    &CleanedRow::sigma_slope_m,  &CleanedRow::sigma_wave_m,   &CleanedRow::cloud_fraction,
    &CleanedRow::georef_rmse_m,  &CleanedRow::sensor_offset_m, &CleanedRow::sigma_sensor_offset_m};
constexpr std::size_t kRealsV1 = 16;

template <class T>
void put(std::string& out, T value) {
  char bytes[sizeof(T)];
  std::memcpy(bytes, &value, sizeof(T));
  out.append(bytes, sizeof(T));
}

void put_text(std::string& out, std::string_view text) {
  put(out, static_cast<std::uint32_t>(text.size()));
  out.append(text);
}

class Reader {
 public:
  explicit Reader(std::string_view bytes) : bytes_(bytes) {}
  template <class T>
  T get() {
    need(sizeof(T));
    T value;
    std::memcpy(&value, bytes_.data() + at_, sizeof(T));
    at_ += sizeof(T);
    return value;
  }
  std::string text() {
    const auto n = get<std::uint32_t>();
    need(n);
    std::string s(bytes_.substr(at_, n));
    at_ += n;
    return s;
  }
  bool done() const { return at_ == bytes_.size(); }

 private:
  void need(std::size_t n) const {
    if (bytes_.size() - at_ < n) throw StoreError("stored result rows are truncated");
  }
  std::string_view bytes_;
  std::size_t at_ = 0;
};

FlagSet flags_from_names(std::string_view list) {
  FlagSet set = 0;
  while (!list.empty()) {
    const auto end = list.find(';');
    const std::string_view name = list.substr(0, end);
    const auto flag = flag_from_name(name);
    if (!flag) throw StoreError("stored result rows name an unknown flag \"" + std::string(name) + "\"");
    set |= flag_bit(*flag);
    list = end == std::string_view::npos ? std::string_view() : list.substr(end + 1);
  }
  return set;
}

}  // namespace

std::string encode_result_rows(const std::vector<CleanedRow>& rows) {
  std::string out(kMagic);
  put(out, static_cast<std::uint32_t>(rows.size()));
  for (const auto& r : rows) {
    put_text(out, r.transect_id);
    put(out, r.time_s);
    put_text(out, r.sensor);
    put_text(out, r.image_id);
    for (auto member : kReals) put(out, r.*member);
    put_text(out, flag_list(r.flags));
    put(out, static_cast<std::uint8_t>(r.accepted ? 1 : 0));
  }
  return out;
}

std::vector<CleanedRow> decode_result_rows(std::string_view bytes) {
  const std::string_view magic = bytes.substr(0, kMagic.size());
  if (magic != kMagic && magic != kMagicV1) throw StoreError("stored result rows have an unknown format");
  const std::size_t n_reals = magic == kMagic ? std::size(kReals) : kRealsV1;
  Reader in(bytes.substr(kMagic.size()));
  std::vector<CleanedRow> rows(in.get<std::uint32_t>());
  for (auto& r : rows) {
    r.transect_id = in.text();
    r.time_s = in.get<TimeS>();
    r.sensor = in.text();
    r.image_id = in.text();
    for (std::size_t k = 0; k < n_reals; ++k) r.*kReals[k] = in.get<double>();
    r.flags = flags_from_names(in.text());
    r.accepted = in.get<std::uint8_t>() != 0;
  }
  if (!in.done()) throw StoreError("stored result rows have trailing bytes");
  return rows;
}

std::vector<CleanedRow> rows_from_series_json(const nlohmann::json& rows) {
  static const char* const kNames[] = {"chainage_raw_m",   "water_level_m",       "setup_m",         "runup_m",
                                       "wave_level_m",     "z_ref_m",             "slope",           "correction_m",
                                       "chainage_m",       "sigma_m",             "sigma_sensor_m",  "sigma_water_level_m",
                                       "sigma_slope_m",    "sigma_wave_m",        "cloud_fraction",  "georef_rmse_m",
                                       "sensor_offset_m",  "sigma_sensor_offset_m"};
  static_assert(std::size(kNames) == std::size(kReals));
  std::vector<CleanedRow> out;
  for (const auto& j : rows) {
    CleanedRow r;
    r.transect_id = j.at("transect_id").get<std::string>();
    r.time_s = parse_time_utc(j.at("time").get<std::string>());
    r.sensor = j.at("sensor").get<std::string>();
    r.image_id = j.at("image_id").get<std::string>();
    for (std::size_t k = 0; k < std::size(kReals); ++k) {
      // Documents written before the sensor-offset columns lack them: unknown.
      if (k >= kRealsV1 && !j.contains(kNames[k])) continue;
      const auto& v = j.at(kNames[k]);
      r.*kReals[k] = v.is_null() ? kUnknown : v.get<double>();
    }
    for (const auto& name : j.at("flags")) r.flags |= flags_from_names(name.get<std::string>());
    r.accepted = j.at("accepted").get<bool>();
    out.push_back(std::move(r));
  }
  return out;
}

}  // namespace strandline::store
