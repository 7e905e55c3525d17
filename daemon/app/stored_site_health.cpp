#include "app/stored_site_health.h"

#include <charconv>
#include <string>
#include <vector>

#include "app/state_keeper.h"
#include "engine/alert_book.h"
#include "engine/engine.h"

namespace bw::app {

Result<StoredSiteHealth> site_health_of_store(const io::StateStore& store) {
  auto checkpoints = store.load_checkpoints();
  if (!checkpoints) return checkpoints.error();
  const io::Checkpoint* book_checkpoint = nullptr;
  std::vector<std::string> assets;
  const auto prefix = engine::Engine::kAssetScopePrefix;
  for (const auto& c : checkpoints.value()) {
    if (c.scope == engine::Engine::kAlertBookScope) book_checkpoint = &c;
    if (c.scope.rfind(prefix, 0) == 0) assets.push_back(c.scope.substr(prefix.size()));
  }
  if (book_checkpoint == nullptr) {
    return Error{"the store holds no alert states yet (nothing has been committed)"};
  }
  auto latest = store.latest_per_alert();
  if (!latest) return latest.error();

  // The book restores only alerts it knows, so define every journaled one first; an alert never
  // journaled has never left normal and adds nothing to the roll-up.
  const std::string& site = book_checkpoint->definition_hash;
  engine::AlertBook book(site, {});
  for (const auto& entry : latest.value()) {
    const auto priority = engine::priority_from_string(entry.priority);
    if (!priority) {
      return Error{"journal entry #" + std::to_string(entry.seq) + " of " + entry.asset + "/" +
                   entry.check + " has an unknown priority '" + entry.priority + "'"};
    }
    book.define(entry.asset, entry.check, *priority, false);
  }
  engine::StateReader reader(book_checkpoint->state);
  if (!book.load(reader)) {
    return Error{
        "the saved alert states cannot be read (written by another version of "
        "brinewatch?)"};
  }

  StoredSiteHealth out{engine::roll_up_site(site, assets, book.not_normal()), std::nullopt};
  auto position = store.meta(kPositionKey);
  if (!position) return position.error();
  if (position.value()) {
    const std::string& text = *position.value();
    std::int64_t us = 0;
    const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), us);
    if (ec != std::errc() || end != text.data() + text.size()) {
      return Error{"the stored input position '" + text + "' is not a whole number"};
    }
    out.as_of = core::SensorTime(core::Micros(us));
  }
  return out;
}

}  // namespace bw::app
