// Strapping tables in configuration: inline in a site or a template, or a CSV file beside the
// site file, and every mistake reported at its file, line and column with what was expected.
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "config/site_loader.h"
#include "spec_lookup.h"

namespace bw::config {
namespace {

namespace fs = std::filesystem;
using testing::asset;
using testing::dump;
using testing::find_named;

const std::string kRules = BRINEWATCH_SOURCE_DIR "/tests/config/fixtures/table_rules";

class StrappingTableConfig : public ::testing::Test {
 protected:
  void SetUp() override {
    folder_ = fs::path(::testing::TempDir()) / ("bw_strapping_" + std::to_string(getpid()));
    fs::create_directories(folder_);
  }
  void TearDown() override { fs::remove_all(folder_); }

  void write(const std::string& name, const std::string& text) {
    std::ofstream(folder_ / name) << text;
  }
  std::string path_of(const std::string& name) const { return (folder_ / name).string(); }

  // A site whose one asset (line 3) gives `parameters` on line 6, column 5.
  LoadResult load(const std::string& parameters, const std::string& rule = "strapped_vessel") {
    // clang-format off
    const std::string text =
        "site: {name: Dry Creek SWD 4, time_zone: America/Chicago}\n"  // line 1
        "assets:\n"                                                    // line 2
        "  tank_a:\n"                                                  // line 3
        "    template: " + rule + "\n"                                 // line 4
        "    tags: {level: DC4.TK1.LEVEL}\n"                           // line 5
        "    " + parameters + "\n";                                    // line 6
    // clang-format on
    return load_site_from_string(text, path_of("site.yaml"), {kRules});
  }

  static void expect_only(const LoadResult& result, const std::string& file, int line, int column,
                          const std::string& message) {
    EXPECT_FALSE(result.ok());
    ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
    const Diagnostic& d = result.diagnostics[0];
    EXPECT_EQ(d.file, file);
    EXPECT_EQ(d.line, line);
    EXPECT_EQ(d.column, column);
    EXPECT_EQ(d.message, message);
  }

  fs::path folder_;
};

const engine::SignalSpec& volume_of(const LoadResult& result) {
  return *find_named(asset(*result.site, "tank_a").signals, "volume");
}

TEST_F(StrappingTableConfig, WithoutATableTheVolumeUsesTheDiameter) {
  const auto result = load("parameters: {diameter: 15.5}");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  EXPECT_EQ(volume_of(result).diameter_ft, 15.5);
  EXPECT_FALSE(volume_of(result).strapping_table.has_value());
}

TEST_F(StrappingTableConfig, AnInlineTableInTheSiteReachesTheSignal) {
  const auto result = load("parameters: {strapping_table: [[0, 0], [1.5, 16.8], [24, 773]]}");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& table = volume_of(result).strapping_table;
  ASSERT_TRUE(table.has_value());
  const std::vector<core::StrappingTable::Point> expected{{0, 0}, {1.5, 16.8}, {24, 773}};
  EXPECT_EQ(table->points(), expected);
}

TEST_F(StrappingTableConfig, ATemplateMayWriteATableInline) {
  const auto result = load("parameters: {}");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const auto& inline_volume = *find_named(asset(*result.site, "tank_a").signals, "inline_volume");
  ASSERT_TRUE(inline_volume.strapping_table.has_value());
  EXPECT_EQ(inline_volume.strapping_table->points().size(), 2u);
}

TEST_F(StrappingTableConfig, ACsvFileBesideTheSiteIsRead) {
  write("tank_a.csv",
        "# invented table\n"
        "level_ft, volume_bbl\n"
        "0, 0\n"
        "\n"
        "1.5, 16.8\n"
        "24,773\n");
  const auto result = load("parameters: {strapping_table: tank_a.csv}");
  ASSERT_TRUE(result.ok()) << dump(result.diagnostics);
  const std::vector<core::StrappingTable::Point> expected{{0, 0}, {1.5, 16.8}, {24, 773}};
  ASSERT_TRUE(volume_of(result).strapping_table.has_value());
  EXPECT_EQ(volume_of(result).strapping_table->points(), expected);
}

TEST_F(StrappingTableConfig, ABadNumberInTheCsvNamesLineAndColumn) {
  write("t.csv", "level_ft,volume_bbl\n0,0\n1, 1O.5\n2,20\n");
  expect_only(load("parameters: {strapping_table: t.csv}"), path_of("t.csv"), 3, 4,
              "strapping table: column 2 (volume, bbl): expected a number, got '1O.5'");
}

TEST_F(StrappingTableConfig, UnsortedLevelsInTheCsvNameTheLine) {
  write("t.csv", "level_ft,volume_bbl\n0,0\n2,20\n1,30\n");
  expect_only(load("parameters: {strapping_table: t.csv}"), path_of("t.csv"), 4, 1,
              "strapping table: level 1 ft is not above the previous level 2 ft (levels must "
              "strictly increase)");
}

TEST_F(StrappingTableConfig, FallingVolumesInTheCsvNameTheLine) {
  write("t.csv", "level_ft,volume_bbl\n0,0\n1,20\n2,19\n");
  expect_only(load("parameters: {strapping_table: t.csv}"), path_of("t.csv"), 4, 1,
              "strapping table: volume 19 bbl is below the previous volume 20 bbl (volumes must "
              "not decrease)");
}

TEST_F(StrappingTableConfig, TooFewRowsInTheCsv) {
  write("t.csv", "level_ft,volume_bbl\n0,0\n");
  expect_only(load("parameters: {strapping_table: t.csv}"), path_of("t.csv"), 2, 0,
              "strapping table: expected at least 2 rows of level (ft), volume (bbl) after the "
              "header, got 1");
}

TEST_F(StrappingTableConfig, ACsvWithoutHeaderIsRefusedRatherThanLosingItsFirstRow) {
  write("t.csv", "0,0\n1,10\n2,20\n");
  const auto result = load("parameters: {strapping_table: t.csv}");
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  EXPECT_EQ(result.diagnostics[0].line, 1);
  EXPECT_NE(result.diagnostics[0].message.find("expected a header line"), std::string::npos);
}

TEST_F(StrappingTableConfig, AWrongNumberOfColumnsInTheCsv) {
  write("t.csv", "level_ft,volume_bbl\n0,0\n1,10,5\n");
  expect_only(load("parameters: {strapping_table: t.csv}"), path_of("t.csv"), 3, 1,
              "strapping table: expected 2 columns (level (ft), volume (bbl)), got 3");
}

TEST_F(StrappingTableConfig, AMissingCsvIsReportedAtTheSiteKey) {
  const auto result = load("parameters: {strapping_table: missing.csv}");
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  const Diagnostic& d = result.diagnostics[0];
  EXPECT_EQ(d.file, path_of("site.yaml"));
  EXPECT_EQ(d.line, 6);
  EXPECT_EQ(d.column, 35);
  EXPECT_EQ(d.message,
            "asset 'tank_a': parameter 'strapping_table': cannot read the strapping "
            "table: cannot open '" +
                path_of("missing.csv") + "': No such file or directory");
}

TEST_F(StrappingTableConfig, AFallingVolumeInlineNamesThePair) {
  expect_only(load("parameters: {strapping_table: [[0, 0], [1, 10], [2, 9]]}"),
              path_of("site.yaml"), 6, 53,
              "asset 'tank_a': parameter 'strapping_table': pair 3: volume 9 bbl is below the "
              "previous volume 10 bbl (volumes must not decrease)");
}

TEST_F(StrappingTableConfig, AnInlinePairMustHoldTwoNumbers) {
  expect_only(load("parameters: {strapping_table: [[0, 0], [1, 10, 3]]}"), path_of("site.yaml"), 6,
              44,
              "asset 'tank_a': parameter 'strapping_table': pair 2: expected [level, volume], got "
              "a list of 3 values");
}

TEST_F(StrappingTableConfig, ATableParameterTakesNoDefault) {
  const auto result = load("parameters: {}", "table_default");
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  EXPECT_EQ(result.diagnostics[0].file, kRules + "/table_default.yaml");
  EXPECT_EQ(result.diagnostics[0].line, 5);
  EXPECT_EQ(result.diagnostics[0].message,
            "parameter 'strapping_table': key 'default': a table parameter takes none (it holds "
            "no table until a site gives one)");
}

TEST_F(StrappingTableConfig, AMisspelledTableParameterSuggestsTheNearest) {
  const auto result = load("parameters: {}", "table_typo");
  ASSERT_EQ(result.diagnostics.size(), 1u) << dump(result.diagnostics);
  EXPECT_EQ(result.diagnostics[0].line, 10);
  EXPECT_EQ(result.diagnostics[0].message,
            "signal 'volume': key 'strapping_table': 'straping_table' names no table parameter "
            "of template 'table_typo'; did you mean 'strapping_table'?");
}

TEST_F(StrappingTableConfig, ATankVolumeNeedsAShapeAndOtherOpsTakeNone) {
  const auto result = load("parameters: {}", "shapeless");
  ASSERT_EQ(result.diagnostics.size(), 2u) << dump(result.diagnostics);
  EXPECT_EQ(result.diagnostics[0].line, 7);
  EXPECT_EQ(result.diagnostics[0].message,
            "signal 'volume' (tank_volume) needs the tank's 'diameter' (ft) or a "
            "'strapping_table'");
  EXPECT_EQ(result.diagnostics[1].line, 8);
  EXPECT_EQ(result.diagnostics[1].message,
            "signal 'scaled' (linear): 'diameter' and 'strapping_table' belong to op tank_volume "
            "only");
}

}  // namespace
}  // namespace bw::config
