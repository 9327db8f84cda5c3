// SPDX-License-Identifier: MIT
// HTTPS requests to a code-hosting platform through libcurl: verification on, timeouts, bounded
// retries with backoff that honour Retry-After. libcurl is used only in this folder.
#pragma once

#include <chrono>
#include <functional>
#include <map>
#include <stdexcept>
#include <string>
#include <vector>

namespace tollgate::annotate {

// A request that could not be answered: the platform refused it, or it never arrived. The
// message is a lowercase sentence that never contains the token.
class PostError : public std::runtime_error {
public:
    // Make an error saying `message`; `status` is the HTTP status that caused it, or 0.
    explicit PostError(const std::string& message, long status = 0)
        : std::runtime_error(message), m_status(status) {}
    // Return the HTTP status that caused the error, or 0 when no answer did.
    long status() const { return m_status; }

private:
    long m_status;
};

// An HTTP method the platforms' comment APIs use.
enum class Method { get, post, put, patch, del };

// Return the method's name as sent ("GET", "POST", "PUT", "PATCH", "DELETE").
const char* method_name(Method method);

// One request to send.
struct HttpRequest {
    Method method = Method::get;      // what to do
    std::string url;                  // absolute http(s) URL
    std::vector<std::string> headers; // "Name: value" lines besides the ones the client adds
    std::string body;                 // sent as is (JSON); empty for GET and DELETE
};

// One answer.
struct HttpResponse {
    long status = 0;                            // HTTP status code
    std::map<std::string, std::string> headers; // lowercased names; the last value of each name
    std::string body;                           // the response body
};

// How a client talks to the platform.
struct HttpSettings {
    std::chrono::milliseconds timeout{30000};         // a whole request, connection included
    std::chrono::milliseconds connect_timeout{10000}; // the connection alone
    unsigned attempts = 4;                            // first try plus retries on 429, 5xx and
                                                      // transport errors (k_default_attempts)
    std::chrono::milliseconds backoff{1000};       // wait before the first retry; doubled each time
    std::chrono::milliseconds longest_wait{60000}; // a Retry-After beyond this ends the retries
    std::string ca_file;    // extra CA certificates (PEM) to trust instead of the system's; empty:
                            // the system's store
    std::string secret;     // the token: removed from every error message the client makes
    std::string user_agent; // sent on every request (GitHub requires one)
};

// Attempts of one request by default: the first try and three retries.
inline constexpr unsigned k_default_attempts = 4;

// Return true when `url` may be requested: https anywhere, plain http only to a loopback host
// (127.0.0.0/8, [::1] or "localhost"), which is where the tests' fake platform listens.
bool url_allowed(const std::string& url);

// Return the scheme, host and port of `url` ("https://git.example:8443"), lowercased; empty when
// `url` is not an absolute http(s) URL.
std::string url_origin(const std::string& url);

// Return the seconds a Retry-After value asks for (delta-seconds or an HTTP date, measured from
// `now`), or -1 when the value is missing or unreadable.
long long retry_after_seconds(const std::string& value, std::chrono::system_clock::time_point now);

// Return `text` with every occurrence of `secret` replaced by "[token]".
std::string redact(std::string text, const std::string& secret);

// Sends requests with one libcurl handle; not thread-safe.
class HttpClient {
public:
    // Make a client with `settings`. Throws PostError when libcurl cannot start.
    explicit HttpClient(HttpSettings settings);
    ~HttpClient();
    HttpClient(const HttpClient&) = delete;
    HttpClient& operator=(const HttpClient&) = delete;

    // Send `request`, retrying on 429, 5xx and transient transport errors (no connection, time-out,
    // broken transfer; never a refused certificate) up to the configured attempts
    // (waiting as Retry-After says, else the doubling backoff), and return the last answer, which
    // may be any status. Throws PostError when `request.url` is not allowed or no answer came.
    HttpResponse send(const HttpRequest& request);

    // Return how many requests went out on the wire so far, retries included.
    unsigned requests_sent() const { return m_sent; }

    // Replace the wait between attempts (tests observe the waits instead of sleeping).
    void set_sleeper(std::function<void(std::chrono::milliseconds)> sleeper) {
        m_sleep = std::move(sleeper);
    }

private:
    HttpResponse send_once(const HttpRequest& request, std::string& transport_error,
                           bool& retryable);

    HttpSettings m_settings;
    void* m_curl = nullptr; // CURL*, kept opaque so that no other folder sees libcurl
    unsigned m_sent = 0;
    std::function<void(std::chrono::milliseconds)> m_sleep;
};

} // namespace tollgate::annotate
