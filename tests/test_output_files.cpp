// write_files_atomically: all the files of a run or none, no temporary file left behind,
// existing files untouched when anything fails.
#include <doctest/doctest.h>

#include <sys/resource.h>
#include <unistd.h>

#include <csignal>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

#include "deltag/error.hpp"
#include "deltag/output_files.hpp"

namespace fs = std::filesystem;
using deltag::InputError;
using deltag::io::OutputFile;
using deltag::io::write_files_atomically;

namespace {

fs::path scratch_root() { return fs::temp_directory_path() / ("deltag-output-test-" + std::to_string(::getpid())); }

// Removes the scratch directory when the test program ends.
const struct RemoveScratch {
    ~RemoveScratch() {
        std::error_code ec;
        fs::remove_all(scratch_root(), ec);
    }
} remove_scratch;

fs::path fresh_dir(const std::string& name) {
    const fs::path d = scratch_root() / name;
    fs::remove_all(d);
    fs::create_directories(d);
    return d;
}

std::string slurp(const fs::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::ostringstream s;
    s << in.rdbuf();
    return s.str();
}

void put(const fs::path& p, const std::string& text) { std::ofstream(p, std::ios::binary) << text; }

// The names in a directory, to see that no temporary file is left over.
std::size_t entries(const fs::path& d) {
    std::size_t n = 0;
    for ([[maybe_unused]] const auto& e : fs::directory_iterator(d)) ++n;
    return n;
}

// The message of the InputError thrown by writing these files ("" if none).
std::string error_of(const std::vector<OutputFile>& files, std::string* key = nullptr) {
    try {
        write_files_atomically(files);
    } catch (const InputError& e) {
        if (key) *key = e.key();
        return e.what();
    }
    return "";
}

bool has(const std::string& text, const std::string& part) { return text.find(part) != std::string::npos; }

}  // namespace

TEST_CASE("output files: every file written, old content replaced, nothing else left") {
    const fs::path d = fresh_dir("all");
    put(d / "a.csv", "old a, longer than the new content\n");
    write_files_atomically({{(d / "a.csv").string(), "new a\n", "sweep[1].csv"},
                            {(d / "b.svg").string(), "<svg/>\n", "sweep[1].svg"}});
    CHECK(slurp(d / "a.csv") == "new a\n");
    CHECK(slurp(d / "b.svg") == "<svg/>\n");
    CHECK(entries(d) == 2);
}

TEST_CASE("output files: a second file that cannot be written leaves the first as it was") {
    const fs::path d = fresh_dir("second");
    put(d / "kept.json", "the report of an earlier run\n");
    std::string key;
    const std::string err = error_of({{(d / "kept.json").string(), "new\n", "--output"},
                                      {(d / "new.csv").string(), "new\n", "sweep[1].csv"},
                                      {(d / "missing-dir" / "x.svg").string(), "new\n", "sweep[1].svg"}},
                                     &key);
    CHECK(has(err, (d / "missing-dir" / "x.svg").string()));
    CHECK(has(err, "cannot write to this file: No such file or directory"));
    CHECK(key == "sweep[1].svg");
    CHECK(slurp(d / "kept.json") == "the report of an earlier run\n");
    CHECK(!fs::exists(d / "new.csv"));
    CHECK(entries(d) == 1);  // no temporary file left
}

TEST_CASE("output files: a directory in the way is refused before anything is written") {
    const fs::path d = fresh_dir("dir");
    fs::create_directory(d / "report.json");
    put(d / "a.csv", "old\n");
    const std::string err =
        error_of({{(d / "a.csv").string(), "new\n", "sweep[1].csv"}, {(d / "report.json").string(), "x", "--output"}});
    CHECK(has(err, "'--output': cannot write to this file: it is a directory"));
    CHECK(slurp(d / "a.csv") == "old\n");
    CHECK(entries(d) == 2);
}

TEST_CASE("output files: an empty path is refused") {
    CHECK(has(error_of({{"", "x", "--output"}}), "expected the path of a file to write, found an empty one"));
}

TEST_CASE("output files: a name longer than the system allows is bad input, not a crash") {
    const fs::path d = fresh_dir("long");
    const std::string err = error_of({{(d / std::string(300, 'n')).string(), "x", "--output"}});
    CHECK(has(err, "cannot write to this file: File name too long"));
    CHECK(entries(d) == 0);
}

TEST_CASE("output files: a write that fails half way leaves the existing file intact") {
    // A file-size limit of 1000 bytes makes the write of a 4000-byte file fail part way
    // (EFBIG; the signal that would end the process is ignored for the test).
    const fs::path d = fresh_dir("half");
    put(d / "report.txt", "the complete earlier report\n");
    rlimit old{};
    REQUIRE(::getrlimit(RLIMIT_FSIZE, &old) == 0);
    const auto old_handler = std::signal(SIGXFSZ, SIG_IGN);
    rlimit low = old;
    low.rlim_cur = 1000;
    REQUIRE(::setrlimit(RLIMIT_FSIZE, &low) == 0);
    const std::string err = error_of({{(d / "report.txt").string(), std::string(4000, 'x'), "--output"}});
    ::setrlimit(RLIMIT_FSIZE, &old);
    std::signal(SIGXFSZ, old_handler);
    CHECK(has(err, "writing failed: File too large"));
    CHECK(slurp(d / "report.txt") == "the complete earlier report\n");
    CHECK(entries(d) == 1);
}

TEST_CASE("output files: a replaced file keeps its permissions; a symbolic link is followed") {
    const fs::path d = fresh_dir("perm");
    put(d / "a.csv", "old\n");
    fs::permissions(d / "a.csv", fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read);
    fs::create_symlink(d / "a.csv", d / "link.csv");
    write_files_atomically({{(d / "link.csv").string(), "new\n", "--output"}});
    CHECK(fs::is_symlink(d / "link.csv"));
    CHECK(slurp(d / "a.csv") == "new\n");
    CHECK(fs::status(d / "a.csv").permissions() == (fs::perms::owner_read | fs::perms::owner_write | fs::perms::group_read));
    CHECK(entries(d) == 2);
}

TEST_CASE("output files: a device is written in place (it cannot be replaced)") {
    write_files_atomically({{"/dev/null", "discarded\n", "--output"}});
    CHECK(fs::is_character_file("/dev/null"));
    CHECK(has(error_of({{"/dev/full", "x", "--output"}}), "/dev/full: '--output': writing failed: No space left on device"));
}

TEST_CASE("output files: a file written in pieces replaces its target whole; a failure half way leaves it") {
    const fs::path d = fresh_dir("pieces");
    const fs::path target = d / "table.csv";
    put(target, "the earlier table\n");
    deltag::io::write_file_atomically(target.string(), "--output", [](const std::function<void(std::string_view)>& out) {
        out("a,b\n");
        for (int i = 0; i < 3; ++i) out(std::to_string(i) + "," + std::to_string(i * i) + "\n");
    });
    CHECK(slurp(target) == "a,b\n0,0\n1,1\n2,4\n");
    CHECK(entries(d) == 1);
    // The producer fails after a piece: the target keeps its content, no temporary is left.
    CHECK_THROWS_AS(deltag::io::write_file_atomically(target.string(), "--output",
                                                      [](const std::function<void(std::string_view)>& out) {
                                                          out("half a table\n");
                                                          throw std::runtime_error("the producer failed");
                                                      }),
                    std::runtime_error);
    CHECK(slurp(target) == "a,b\n0,0\n1,1\n2,4\n");
    CHECK(entries(d) == 1);
    // A directory in the way is bad input, named by the key.
    fs::create_directories(d / "dir");
    try {
        deltag::io::write_file_atomically((d / "dir").string(), "--output", [](const auto& out) { out("x"); });
        FAIL("expected an InputError");
    } catch (const InputError& e) {
        CHECK(e.key() == "--output");
        CHECK(has(e.what(), "cannot write to this file: it is a directory"));
    }
}
