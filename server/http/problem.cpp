#include "server/http/problem.h"

namespace strandline::http {

nlohmann::json Problem::to_json(const std::string& instance) const {
  nlohmann::json j = {{"type", type}, {"title", title}, {"status", status}, {"detail", detail}};
  if (!instance.empty()) j["instance"] = instance;
  for (auto it = extra.begin(); it != extra.end(); ++it) j[it.key()] = it.value();
  return j;
}

}  // namespace strandline::http
