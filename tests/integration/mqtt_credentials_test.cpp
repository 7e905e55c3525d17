// The broker credentials file: two lines, private to its owner.
#include "io/mqtt_credentials.h"

#include <gtest/gtest.h>
#include <sys/stat.h>

#include <filesystem>
#include <fstream>
#include <string>

namespace bw::io {
namespace {

class CredentialsFile : public ::testing::Test {
 protected:
  void SetUp() override {
    path_ = ::testing::TempDir() + "brinewatch_credentials_" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name();
  }
  void TearDown() override { std::filesystem::remove(path_); }

  void write(const std::string& text, mode_t mode) {
    std::ofstream(path_, std::ios::binary | std::ios::trunc) << text;
    ASSERT_EQ(::chmod(path_.c_str(), mode), 0);
  }

  std::string path_;
};

TEST_F(CredentialsFile, PrivateFileGivesUserAndPassword) {
  write("swd4-edge\nbrine-42\n", 0600);
  Result<MqttCredentials> read = read_mqtt_credentials(path_);
  ASSERT_TRUE(read.ok()) << read.error().message;
  EXPECT_EQ(read->username, "swd4-edge");
  EXPECT_EQ(read->password, "brine-42");
}

TEST_F(CredentialsFile, WindowsLineEndsAndMissingFinalNewlineAreAccepted) {
  write("swd4-edge\r\nbrine-42", 0400);
  Result<MqttCredentials> read = read_mqtt_credentials(path_);
  ASSERT_TRUE(read.ok()) << read.error().message;
  EXPECT_EQ(read->username, "swd4-edge");
  EXPECT_EQ(read->password, "brine-42");
}

TEST_F(CredentialsFile, ReadableByOthersIsRefusedWithTheFix) {
  // Permission bits per POSIX: 0644 lets group and others read (common practice: secrets 0600).
  write("swd4-edge\nbrine-42\n", 0644);
  Result<MqttCredentials> read = read_mqtt_credentials(path_);
  ASSERT_FALSE(read.ok());
  EXPECT_NE(read.error().message.find(path_), std::string::npos) << read.error().message;
  EXPECT_NE(read.error().message.find("chmod 600"), std::string::npos) << read.error().message;
  EXPECT_NE(read.error().message.find("0644"), std::string::npos) << read.error().message;
}

TEST_F(CredentialsFile, ReadableByGroupOnlyIsRefused) {
  write("swd4-edge\nbrine-42\n", 0640);
  EXPECT_FALSE(read_mqtt_credentials(path_).ok());
}

TEST_F(CredentialsFile, MissingPasswordLineIsRefused) {
  write("swd4-edge\n", 0600);
  Result<MqttCredentials> read = read_mqtt_credentials(path_);
  ASSERT_FALSE(read.ok());
  EXPECT_NE(read.error().message.find("password"), std::string::npos) << read.error().message;
}

TEST_F(CredentialsFile, ExtraLinesAreRefused) {
  write("swd4-edge\nbrine-42\nleftover\n", 0600);
  EXPECT_FALSE(read_mqtt_credentials(path_).ok());
}

TEST_F(CredentialsFile, MissingFileNamesThePath) {
  Result<MqttCredentials> read = read_mqtt_credentials(path_ + ".absent");
  ASSERT_FALSE(read.ok());
  EXPECT_NE(read.error().message.find(path_ + ".absent"), std::string::npos);
}

}  // namespace
}  // namespace bw::io
