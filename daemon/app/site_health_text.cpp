#include "app/site_health_text.h"

#include <algorithm>
#include <array>

#include "core/utc_text.h"
#include "engine/alert.h"

namespace bw::app {
namespace {

using engine::HealthFigures;
using engine::Priority;

// Rows of cells, padded to the widest cell of each column (the last column is not padded).
class TextTable {
 public:
  void add(std::vector<std::string> row) { rows_.push_back(std::move(row)); }
  std::string render(const std::string& indent) const {
    std::vector<std::size_t> widths;
    for (const auto& row : rows_) {
      widths.resize(std::max(widths.size(), row.size()));
      for (std::size_t c = 0; c < row.size(); ++c) widths[c] = std::max(widths[c], row[c].size());
    }
    std::string out;
    for (const auto& row : rows_) {
      std::string line = indent;
      for (std::size_t c = 0; c < row.size(); ++c) {
        line += row[c];
        if (c + 1 < row.size()) line += std::string(widths[c] - row[c].size() + 2, ' ');
      }
      while (!line.empty() && line.back() == ' ') line.pop_back();
      out += line + "\n";
    }
    return out;
  }

 private:
  std::vector<std::vector<std::string>> rows_;
};

// "1 urgent, 2 low", or "-".
std::string counts_cell(const engine::PriorityCounts& counts) {
  std::string cell;
  for (const Priority p : {Priority::urgent, Priority::high, Priority::medium, Priority::low}) {
    if (counts[p] == 0) continue;
    if (!cell.empty()) cell += ", ";
    cell += std::to_string(counts[p]) + " " + std::string(engine::to_string(p));
  }
  return cell.empty() ? "-" : cell;
}

std::string set_aside_cell(const HealthFigures& f) {
  const std::array<std::pair<std::uint32_t, const char*>, 3> parts = {
      {{f.shelved, "shelved"}, {f.suppressed, "suppressed"}, {f.out_of_service, "out of service"}}};
  std::string cell;
  for (const auto& [n, word] : parts) {
    if (n == 0) continue;
    if (!cell.empty()) cell += ", ";
    cell += std::to_string(n) + " " + word;
  }
  return cell.empty() ? "-" : cell;
}

std::string time_cell(const std::optional<core::SensorTime>& t) {
  return t ? core::format_utc(*t) : "-";
}

const std::vector<std::string> kFigureHeadings = {
    "status", "unacknowledged", "acknowledged", "to review", "set aside", "oldest unacknowledged"};

std::vector<std::string> figure_cells(const HealthFigures& f) {
  return {std::string(engine::to_string(f.status())),
          counts_cell(f.unacknowledged),
          counts_cell(f.acknowledged),
          counts_cell(f.to_review),
          set_aside_cell(f),
          time_cell(f.oldest_unacknowledged)};
}

std::vector<std::string> joined(std::vector<std::string> head,
                                const std::vector<std::string>& tail) {
  head.insert(head.end(), tail.begin(), tail.end());
  return head;
}

}  // namespace

std::string format_site_health(const engine::SiteHealth& health,
                               std::optional<core::SensorTime> as_of) {
  std::string out = "site health";
  if (as_of) out += " as of " + core::format_utc(*as_of);
  out +=
      ": " + std::string(engine::to_string(health.figures.status())) + " (" + health.site + ")\n";
  TextTable table;
  table.add(joined({"asset"}, kFigureHeadings));
  for (const auto& row : health.assets) table.add(joined({row.asset}, figure_cells(row.figures)));
  table.add(joined({"whole site"}, figure_cells(health.figures)));
  return out + table.render("  ");
}

std::string format_visit_order(std::vector<RankedSite>& sites) {
  const auto readable = std::stable_partition(
      sites.begin(), sites.end(), [](const RankedSite& s) { return s.health.has_value(); });
  std::stable_sort(sites.begin(), readable, [](const RankedSite& a, const RankedSite& b) {
    return engine::visit_before(*a.health, *b.health);
  });
  const auto count = static_cast<std::size_t>(readable - sites.begin());
  std::string out =
      "visit order (" + std::to_string(count) + (count == 1 ? " site" : " sites") + "):\n";
  TextTable table;
  table.add(joined(joined({"#", "site"}, kFigureHeadings), {"as of", "state"}));
  std::size_t rank = 0;
  for (auto it = sites.begin(); it != readable; ++it) {
    table.add(joined(
        joined({std::to_string(++rank), it->health->site}, figure_cells(it->health->figures)),
        {time_cell(it->as_of), it->dir}));
  }
  out += table.render("  ");
  for (auto it = readable; it != sites.end(); ++it) {
    out += "could not read " + it->dir + ": " + it->problem + "\n";
  }
  return out;
}

}  // namespace bw::app
