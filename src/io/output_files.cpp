// All the files of a run, written together or not at all (see output_files.hpp).
#include "deltag/output_files.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <functional>
#include <string_view>

#include "deltag/error.hpp"

namespace deltag::io {

namespace {

namespace fs = std::filesystem;

[[noreturn]] void fail(const OutputFile& f, const std::string& what, int err) {
    throw InputError(SourceLocation{f.path}, f.key, err ? what + ": " + std::strerror(err) : what);
}

// Writes all of `text` to an open descriptor; 0 or the errno of the failure.
int write_all(int fd, std::string_view text) {
    const char* p = text.data();
    std::size_t left = text.size();
    while (left > 0) {
        const ssize_t n = ::write(fd, p, left);
        if (n < 0) {
            if (errno == EINTR) continue;
            return errno;
        }
        p += n;
        left -= static_cast<std::size_t>(n);
    }
    return 0;
}

struct Planned {
    const OutputFile* file = nullptr;
    std::string target;      // the path replaced (a symbolic link followed)
    bool in_place = false;   // not a regular file: written directly
    bool replaces = false;   // an existing regular file
    mode_t mode = 0666;      // of the file replaced
    std::string temp;        // the temporary file, once created
};

// Removes the temporary files that were not renamed, whatever way the function is left.
struct TempFiles {
    std::vector<Planned>& plan;
    ~TempFiles() {
        for (auto& p : plan)
            if (!p.temp.empty()) ::unlink(p.temp.c_str());
    }
};

Planned plan_one(const OutputFile& f) {
    Planned p;
    p.file = &f;
    p.target = f.path;
    if (f.path.empty()) fail(f, "expected the path of a file to write, found an empty one", 0);
    struct stat st {};
    if (::stat(f.path.c_str(), &st) == 0) {
        if (S_ISDIR(st.st_mode)) fail(f, "cannot write to this file: it is a directory", 0);
        if (!S_ISREG(st.st_mode)) {
            p.in_place = true;
            return p;
        }
        p.replaces = true;
        p.mode = st.st_mode & 07777;
        struct stat lst {};
        if (::lstat(f.path.c_str(), &lst) == 0 && S_ISLNK(lst.st_mode)) {
            std::error_code ec;
            const fs::path real = fs::canonical(f.path, ec);
            if (!ec) p.target = real.string();  // else it changed meanwhile: the link is replaced
        }
        return p;
    }
    // Not there yet: a new file. Any other reason (a name too long, a missing or
    // forbidden directory on the way) is reported by creating the temporary file.
    if (errno != ENOENT) fail(f, "cannot write to this file", errno);
    return p;
}

// Writes a file's content to an open descriptor: 0 or the errno of the failure.
using Body = std::function<int(int fd)>;

void write_temp(Planned& p, const Body& body) {
    static std::atomic<unsigned> counter{0};
    const fs::path target(p.target);
    fs::path dir = target.parent_path();
    if (dir.empty()) dir = ".";
    // Short enough for any file system (NAME_MAX 255) however long the target's name is.
    std::string name = target.filename().string().substr(0, 120);
    for (int attempt = 0;; ++attempt) {
        const std::string temp = (dir / ("." + name + ".deltag-tmp-" + std::to_string(::getpid()) + "-" +
                                         std::to_string(counter.fetch_add(1))))
                                     .string();
        const int fd = ::open(temp.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, p.mode);
        if (fd < 0) {
            if (errno == EEXIST && attempt < 100) continue;
            fail(*p.file, "cannot write to this file", errno);
        }
        p.temp = temp;
        int err = 0;
        if (p.replaces && ::fchmod(fd, p.mode) != 0) err = errno;
        if (!err) {
            try {
                err = body(fd);
            } catch (...) {
                ::close(fd);
                throw;
            }
        }
        if (!err && ::fsync(fd) != 0) err = errno;
        if (::close(fd) != 0 && !err) err = errno;
        if (err) fail(*p.file, "writing failed", err);
        return;
    }
}

void write_in_place(const Planned& p, const Body& body) {
    const int fd = ::open(p.target.c_str(), O_WRONLY | O_TRUNC | O_CLOEXEC);
    if (fd < 0) fail(*p.file, "cannot write to this file", errno);
    int err = 0;
    try {
        err = body(fd);
    } catch (...) {
        ::close(fd);
        throw;
    }
    if (::close(fd) != 0 && !err) err = errno;
    if (err) fail(*p.file, "writing failed", err);
}

}  // namespace

void write_files_atomically(const std::vector<OutputFile>& files) {
    std::vector<Planned> plan;
    plan.reserve(files.size());
    for (const auto& f : files) plan.push_back(plan_one(f));
    const TempFiles cleanup{plan};
    for (auto& p : plan)
        if (!p.in_place) write_temp(p, [&](int fd) { return write_all(fd, p.file->content); });
    for (const auto& p : plan)
        if (p.in_place) write_in_place(p, [&](int fd) { return write_all(fd, p.file->content); });
    for (auto& p : plan) {
        if (p.in_place) continue;
        if (std::rename(p.temp.c_str(), p.target.c_str()) != 0) fail(*p.file, "cannot write to this file", errno);
        p.temp.clear();
    }
}

void write_file_atomically(const std::string& path, const std::string& key,
                           const std::function<void(const std::function<void(std::string_view)>&)>& produce) {
    const OutputFile f{path, {}, key};
    std::vector<Planned> plan{plan_one(f)};
    const TempFiles cleanup{plan};
    Planned& p = plan.front();
    const Body body = [&](int fd) {
        int err = 0;
        produce([&](std::string_view piece) {
            if (!err) err = write_all(fd, piece);
        });
        return err;
    };
    if (p.in_place) {
        write_in_place(p, body);
        return;
    }
    write_temp(p, body);
    if (std::rename(p.temp.c_str(), p.target.c_str()) != 0) fail(f, "cannot write to this file", errno);
    p.temp.clear();
}

}  // namespace deltag::io
