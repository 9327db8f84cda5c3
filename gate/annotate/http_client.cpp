// SPDX-License-Identifier: MIT
// The libcurl client: one easy handle, verification always on, bounded retries.
#include "gate/annotate/http_client.hpp"

#include <algorithm>
#include <cctype>
#include <cstring>
#include <ctime>
#include <curl/curl.h>
#include <mutex>
#include <spdlog/spdlog.h>
#include <thread>

namespace tollgate::annotate {

namespace {

// libcurl's global state is set up once per process (curl_global_init is not thread-safe).
void initialise_curl_once() {
    static std::once_flag once;
    std::call_once(once, [] { curl_global_init(CURL_GLOBAL_DEFAULT); });
}

std::string lowercase(std::string text) {
    std::transform(text.begin(), text.end(), text.begin(),
                   [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
    return text;
}

std::string trim(const std::string& text) {
    const auto first = text.find_first_not_of(" \t\r\n");
    if (first == std::string::npos) {
        return {};
    }
    const auto last = text.find_last_not_of(" \t\r\n");
    return text.substr(first, last - first + 1);
}

// The parts of an absolute URL that decide where a request goes.
struct UrlParts {
    std::string scheme; // lowercased
    std::string host;   // lowercased; an IPv6 address keeps its brackets
    std::string port;   // as written; empty when absent
};

bool split_url(const std::string& url, UrlParts& parts) {
    const auto scheme_end = url.find("://");
    if (scheme_end == std::string::npos) {
        return false;
    }
    parts.scheme = lowercase(url.substr(0, scheme_end));
    if (parts.scheme != "http" && parts.scheme != "https") {
        return false;
    }
    const auto authority_start = scheme_end + 3;
    const auto authority_end = url.find_first_of("/?#", authority_start);
    std::string authority = url.substr(authority_start, authority_end == std::string::npos
                                                            ? std::string::npos
                                                            : authority_end - authority_start);
    if (authority.find('@') != std::string::npos || authority.empty()) {
        return false; // credentials in a URL are never sent
    }
    if (authority[0] == '[') {
        const auto close = authority.find(']');
        if (close == std::string::npos) {
            return false;
        }
        parts.host = lowercase(authority.substr(0, close + 1));
        const std::string rest = authority.substr(close + 1);
        if (!rest.empty() && rest[0] != ':') {
            return false;
        }
        parts.port = rest.empty() ? std::string() : rest.substr(1);
    } else {
        const auto colon = authority.find(':');
        parts.host = lowercase(authority.substr(0, colon));
        parts.port = colon == std::string::npos ? std::string() : authority.substr(colon + 1);
    }
    return !parts.host.empty() && std::all_of(parts.port.begin(), parts.port.end(),
                                              [](unsigned char c) { return std::isdigit(c) != 0; });
}

bool is_loopback_host(const std::string& host) {
    if (host == "localhost" || host == "[::1]") {
        return true;
    }
    // 127.0.0.0/8 written as a dotted quad.
    unsigned parts = 0;
    std::size_t start = 0;
    for (;;) {
        const auto dot = host.find('.', start);
        const std::string part = host.substr(start, dot - start);
        if (part.empty() || part.size() > 3 ||
            !std::all_of(part.begin(), part.end(),
                         [](unsigned char c) { return std::isdigit(c) != 0; }) ||
            std::stoi(part) > 255 || (parts == 0 && part != "127")) {
            return false;
        }
        ++parts;
        if (dot == std::string::npos) {
            break;
        }
        start = dot + 1;
    }
    return parts == 4;
}

std::size_t collect_body(char* data, std::size_t size, std::size_t count, void* user) {
    static_cast<std::string*>(user)->append(data, size * count);
    return size * count;
}

std::size_t collect_header(char* data, std::size_t size, std::size_t count, void* user) {
    auto& headers = *static_cast<std::map<std::string, std::string>*>(user);
    const std::string line(data, size * count);
    if (line.rfind("HTTP/", 0) == 0) {
        headers.clear(); // a new response (after "100 Continue") starts its own headers
    } else if (const auto colon = line.find(':'); colon != std::string::npos) {
        headers[lowercase(trim(line.substr(0, colon)))] = trim(line.substr(colon + 1));
    }
    return size * count;
}

bool worth_retrying(long status) {
    return status == 429 || (status >= 500 && status <= 599);
}

// Transport errors that may pass by themselves; a refused certificate or a bad URL does not.
bool transient(CURLcode code) {
    switch (code) {
    case CURLE_COULDNT_RESOLVE_HOST:
    case CURLE_COULDNT_CONNECT:
    case CURLE_OPERATION_TIMEDOUT:
    case CURLE_SEND_ERROR:
    case CURLE_RECV_ERROR:
    case CURLE_GOT_NOTHING:
    case CURLE_PARTIAL_FILE:
        return true;
    default:
        return false;
    }
}

// Own a curl_slist of request headers.
struct HeaderList {
    curl_slist* list = nullptr;
    ~HeaderList() { curl_slist_free_all(list); }
    void add(const std::string& line) {
        if (curl_slist* grown = curl_slist_append(list, line.c_str())) {
            list = grown;
        }
    }
};

} // namespace

const char* method_name(Method method) {
    switch (method) {
    case Method::get:
        return "GET";
    case Method::post:
        return "POST";
    case Method::put:
        return "PUT";
    case Method::patch:
        return "PATCH";
    case Method::del:
        return "DELETE";
    }
    return "GET";
}

bool url_allowed(const std::string& url) {
    UrlParts parts;
    if (!split_url(url, parts)) {
        return false;
    }
    return parts.scheme == "https" || is_loopback_host(parts.host);
}

std::string url_origin(const std::string& url) {
    UrlParts parts;
    if (!split_url(url, parts)) {
        return {};
    }
    std::string port = parts.port;
    if ((parts.scheme == "https" && port == "443") || (parts.scheme == "http" && port == "80")) {
        port.clear();
    }
    return parts.scheme + "://" + parts.host + (port.empty() ? "" : ":" + port);
}

long long retry_after_seconds(const std::string& value, std::chrono::system_clock::time_point now) {
    const std::string text = trim(value);
    if (text.empty()) {
        return -1;
    }
    if (std::all_of(text.begin(), text.end(),
                    [](unsigned char c) { return std::isdigit(c) != 0; })) {
        return text.size() > 9 ? 999999999LL : std::stoll(text);
    }
    // An HTTP date (RFC 9110 section 10.2.3, IMF-fixdate), e.g. "Wed, 21 Oct 2015 07:28:00 GMT".
    std::tm parsed{};
    const char* end = ::strptime(text.c_str(), "%a, %d %b %Y %H:%M:%S GMT", &parsed);
    if (end == nullptr || *end != '\0') {
        return -1;
    }
    const std::time_t when = ::timegm(&parsed);
    const std::time_t current = std::chrono::system_clock::to_time_t(now);
    return when <= current ? 0 : static_cast<long long>(when - current);
}

std::string redact(std::string text, const std::string& secret) {
    if (secret.empty()) {
        return text;
    }
    for (auto pos = text.find(secret); pos != std::string::npos; pos = text.find(secret, pos)) {
        text.replace(pos, secret.size(), "[token]");
    }
    return text;
}

HttpClient::HttpClient(HttpSettings settings) : m_settings(std::move(settings)) {
    initialise_curl_once();
    m_curl = curl_easy_init();
    if (m_curl == nullptr) {
        throw PostError("cannot start libcurl");
    }
    m_sleep = [](std::chrono::milliseconds wait) { std::this_thread::sleep_for(wait); };
}

HttpClient::~HttpClient() {
    curl_easy_cleanup(static_cast<CURL*>(m_curl));
}

HttpResponse HttpClient::send_once(const HttpRequest& request, std::string& transport_error,
                                   bool& retryable) {
    CURL* curl = static_cast<CURL*>(m_curl);
    curl_easy_reset(curl);
    HttpResponse response;
    HeaderList headers;
    for (const auto& line : request.headers) {
        headers.add(line);
    }
    if (!request.body.empty()) {
        headers.add("Content-Type: application/json");
    }
    headers.add("Expect:"); // no "100 Continue" round trip for large bodies
    char error[CURL_ERROR_SIZE] = {0};
    curl_easy_setopt(curl, CURLOPT_URL, request.url.c_str());
    curl_easy_setopt(curl, CURLOPT_PROTOCOLS_STR, "http,https");
    curl_easy_setopt(curl, CURLOPT_FOLLOWLOCATION, 0L); // a redirect never carries the token on
    curl_easy_setopt(curl, CURLOPT_SSL_VERIFYPEER, 1L);
    curl_easy_setopt(curl, CURLOPT_SSL_VERIFYHOST, 2L);
    if (!m_settings.ca_file.empty()) {
        curl_easy_setopt(curl, CURLOPT_CAINFO, m_settings.ca_file.c_str());
    }
    curl_easy_setopt(curl, CURLOPT_NOSIGNAL, 1L);
    curl_easy_setopt(curl, CURLOPT_NOPROXY, "localhost,127.0.0.1,::1");
    curl_easy_setopt(curl, CURLOPT_TIMEOUT_MS, static_cast<long>(m_settings.timeout.count()));
    curl_easy_setopt(curl, CURLOPT_CONNECTTIMEOUT_MS,
                     static_cast<long>(m_settings.connect_timeout.count()));
    curl_easy_setopt(curl, CURLOPT_ERRORBUFFER, error);
    curl_easy_setopt(curl, CURLOPT_USERAGENT, m_settings.user_agent.c_str());
    curl_easy_setopt(curl, CURLOPT_HTTPHEADER, headers.list);
    curl_easy_setopt(curl, CURLOPT_WRITEFUNCTION, &collect_body);
    curl_easy_setopt(curl, CURLOPT_WRITEDATA, &response.body);
    curl_easy_setopt(curl, CURLOPT_HEADERFUNCTION, &collect_header);
    curl_easy_setopt(curl, CURLOPT_HEADERDATA, &response.headers);
    curl_easy_setopt(curl, CURLOPT_CUSTOMREQUEST, method_name(request.method));
    if (request.method == Method::get) {
        curl_easy_setopt(curl, CURLOPT_HTTPGET, 1L);
        curl_easy_setopt(curl, CURLOPT_CUSTOMREQUEST, nullptr);
    } else if (request.method != Method::del || !request.body.empty()) {
        curl_easy_setopt(curl, CURLOPT_POSTFIELDS, request.body.c_str());
        curl_easy_setopt(curl, CURLOPT_POSTFIELDSIZE_LARGE,
                         static_cast<curl_off_t>(request.body.size()));
    }
    ++m_sent;
    const CURLcode code = curl_easy_perform(curl);
    if (code != CURLE_OK) {
        transport_error = error[0] != '\0' ? std::string(error) : curl_easy_strerror(code);
        retryable = transient(code);
        return response;
    }
    curl_easy_getinfo(curl, CURLINFO_RESPONSE_CODE, &response.status);
    return response;
}

HttpResponse HttpClient::send(const HttpRequest& request) {
    if (!url_allowed(request.url)) {
        throw PostError("refusing to send the token to \"" +
                        redact(request.url, m_settings.secret) +
                        "\" (only https, or plain http to a loopback address, is allowed)");
    }
    std::chrono::milliseconds backoff = m_settings.backoff;
    const unsigned attempts = std::max(1U, m_settings.attempts);
    for (unsigned attempt = 1;; ++attempt) {
        std::string transport_error;
        bool retryable = true;
        HttpResponse response = send_once(request, transport_error, retryable);
        const bool failed = !transport_error.empty();
        if (!failed && !worth_retrying(response.status)) {
            return response;
        }
        const std::string what = failed ? redact(transport_error, m_settings.secret)
                                        : "HTTP " + std::to_string(response.status);
        if (attempt >= attempts || !retryable) {
            if (failed) {
                throw PostError(std::string(method_name(request.method)) + " " +
                                redact(request.url, m_settings.secret) + " failed after " +
                                std::to_string(attempt) + " attempt" + (attempt == 1 ? "" : "s") +
                                ": " + what);
            }
            return response; // the caller reads the status and says what it means
        }
        std::chrono::milliseconds wait = backoff;
        if (!failed) {
            const auto header = response.headers.find("retry-after");
            const long long asked =
                header == response.headers.end()
                    ? -1
                    : retry_after_seconds(header->second, std::chrono::system_clock::now());
            if (asked >= 0) {
                wait = std::chrono::milliseconds(asked * 1000);
                if (wait > m_settings.longest_wait) {
                    throw PostError("the platform asks to retry after " + std::to_string(asked) +
                                    " s (" + what + "), longer than tollgate waits (" +
                                    std::to_string(m_settings.longest_wait.count() / 1000) + " s)");
                }
            }
        }
        spdlog::debug("{} {}: {}; attempt {} of {} in {} ms", method_name(request.method),
                      redact(request.url, m_settings.secret), what, attempt + 1, attempts,
                      wait.count());
        m_sleep(wait);
        backoff *= 2;
    }
}

} // namespace tollgate::annotate
