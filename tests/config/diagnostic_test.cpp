#include "config/diagnostic.h"

#include <gtest/gtest.h>

#include "config/source_text.h"

namespace bw::config {
namespace {

TEST(FormatDiagnostic, QuotesTheLineWithACaretUnderTheColumn) {
  const Diagnostic d{"site.yaml", 7, 5, "asset 'tank_1': unknown key 'tag'", "    tag: {level: X}"};
  EXPECT_EQ(format_diagnostic(d),
            "site.yaml:7:5: asset 'tank_1': unknown key 'tag'\n"
            "        tag: {level: X}\n"
            "        ^");
}

TEST(FormatDiagnostic, KeepsTabsSoTheCaretLinesUp) {
  const Diagnostic d{"a.yaml", 1, 3, "bad", "\tx: 1"};
  EXPECT_EQ(format_diagnostic(d), "a.yaml:1:3: bad\n    \tx: 1\n    \t ^");
}

TEST(FormatDiagnostic, WithoutAPositionNamesOnlyTheFile) {
  const Diagnostic d{"missing.yaml", 0, 0, "cannot open 'missing.yaml': No such file", ""};
  EXPECT_EQ(format_diagnostic(d), "missing.yaml: cannot open 'missing.yaml': No such file");
}

TEST(SourceText, QuotesTheRequestedLineWithoutItsLineEnding) {
  const SourceText text("f.yaml", "a: 1\r\nb: 2\nc: 3");
  EXPECT_EQ(text.line(1), "a: 1");
  EXPECT_EQ(text.line(3), "c: 3");
  EXPECT_EQ(text.line(4), "");
  EXPECT_EQ(text.line(0), "");
  const Diagnostic d = text.at(2, 4, "bad value");
  EXPECT_EQ(d.file, "f.yaml");
  EXPECT_EQ(d.source_line, "b: 2");
}

}  // namespace
}  // namespace bw::config
