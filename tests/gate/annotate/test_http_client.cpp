// SPDX-License-Identifier: MIT
// The libcurl client against the fake platform on loopback: retries, Retry-After, timeouts,
// refusals before sending, and TLS verification with a certificate made by openssl.
#include "gate/annotate/http_client.hpp"
#include "support/fake_forge.hpp"
#include "support/temp_repo.hpp"

#include <catch2/catch.hpp>
#include <filesystem>

using namespace tollgate::annotate;
using std::chrono::milliseconds;
using tollgate::test::FakeForge;
using tollgate::test::python_available;
using tollgate::test::run_command;
using tollgate::test::TempDir;

namespace {

const char* const k_token = "tg-test-0123456789abcdef";

nlohmann::json base_config() {
    return {{"token", k_token}, {"github_user_status", 200}};
}

HttpRequest user_request(const std::string& origin) {
    HttpRequest request;
    request.url = origin + "/user";
    request.headers = {std::string("Authorization: Bearer ") + k_token};
    return request;
}

HttpSettings settings() {
    HttpSettings s;
    s.user_agent = "tollgate-test";
    s.secret = k_token;
    s.timeout = milliseconds(5000);
    return s;
}

// Make a self-signed certificate for 127.0.0.1 (CA:TRUE, so it can be its own trust anchor) in
// `dir` as NAME.pem and NAME.key; false when openssl is missing.
bool make_certificate(const TempDir& dir, const std::string& name) {
    const auto made =
        run_command("openssl req -x509 -newkey rsa:2048 -nodes -days 2 -subj '/CN=tollgate test' "
                    "-addext 'subjectAltName=IP:127.0.0.1' -keyout " +
                        name + ".key -out " + name + ".pem",
                    dir.path());
    return made.exit_code == 0;
}

} // namespace

TEST_CASE("HttpClient::send retries", "[annotate]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    std::vector<milliseconds> waits;
    HttpClient client(settings());
    client.set_sleeper([&waits](milliseconds wait) { waits.push_back(wait); });

    SECTION("a 500 is retried with doubling waits, and retries stop after the documented count") {
        auto config = base_config();
        config["faults"] = {{{"path", "^/user$"}, {"status", 500}}};
        FakeForge forge(config);
        const HttpResponse response = client.send(user_request(forge.origin()));
        CHECK(response.status == 500);
        CHECK(forge.requests("GET", "/user").size() == k_default_attempts);
        CHECK(client.requests_sent() == 4);
        CHECK(waits == std::vector<milliseconds>{milliseconds(1000), milliseconds(2000),
                                                 milliseconds(4000)});
    }
    SECTION("a 429 waits as Retry-After says, then succeeds") {
        auto config = base_config();
        config["faults"] = {
            {{"path", "^/user$"}, {"status", 429}, {"retry_after", "3"}, {"times", 2}}};
        FakeForge forge(config);
        const HttpResponse response = client.send(user_request(forge.origin()));
        CHECK(response.status == 200);
        CHECK(forge.requests("GET", "/user").size() == 3);
        CHECK(waits == std::vector<milliseconds>{milliseconds(3000), milliseconds(3000)});
    }
    SECTION("a Retry-After longer than tollgate waits ends the retries at once") {
        auto config = base_config();
        config["faults"] = {{{"path", "^/user$"}, {"status", 503}, {"retry_after", "3600"}}};
        FakeForge forge(config);
        CHECK_THROWS_WITH(client.send(user_request(forge.origin())),
                          "the platform asks to retry after 3600 s (HTTP 503), longer than "
                          "tollgate waits (60 s)");
        CHECK(forge.requests().size() == 1);
        CHECK(waits.empty());
    }
    SECTION("4xx answers other than 429 are not retried") {
        for (const int status : {401, 404, 422}) {
            auto config = base_config();
            config["faults"] = {{{"path", "^/user$"}, {"status", status}}};
            FakeForge forge(config);
            CHECK(client.send(user_request(forge.origin())).status == status);
            CHECK(forge.requests().size() == 1);
        }
        CHECK(waits.empty());
    }
}

TEST_CASE("HttpClient::send failures without an answer", "[annotate]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    std::vector<milliseconds> waits;
    SECTION("a slow answer runs into the timeout, each attempt") {
        auto config = base_config();
        config["slow"] = {{"path", "^/user$"}, {"seconds", 3}};
        FakeForge forge(config);
        HttpSettings s = settings();
        s.timeout = milliseconds(300);
        s.attempts = 2;
        HttpClient client(s);
        client.set_sleeper([&waits](milliseconds wait) { waits.push_back(wait); });
        try {
            client.send(user_request(forge.origin()));
            FAIL("a slow answer should have timed out");
        } catch (const PostError& e) {
            const std::string message = e.what();
            CHECK(message.rfind("GET " + forge.origin() + "/user failed after 2 attempts: ", 0) ==
                  0);
            CHECK(message.find("timed out") != std::string::npos);
        }
        CHECK(waits.size() == 1);
    }
    SECTION("a closed port is a transport error after every attempt") {
        int port = 0;
        {
            FakeForge gone(base_config());
            port = gone.port();
        }
        HttpClient client(settings());
        client.set_sleeper([&waits](milliseconds wait) { waits.push_back(wait); });
        CHECK_THROWS_WITH(client.send(user_request("http://127.0.0.1:" + std::to_string(port))),
                          Catch::StartsWith("GET http://127.0.0.1:" + std::to_string(port) +
                                            "/user failed after 4 attempts: "));
        CHECK(client.requests_sent() == 4);
    }
    SECTION("plain http off loopback is refused before anything is sent") {
        HttpClient client(settings());
        HttpRequest request = user_request("http://gitlab.example");
        CHECK_THROWS_WITH(client.send(request),
                          "refusing to send the token to \"http://gitlab.example/user\" (only "
                          "https, or plain http to a loopback address, is allowed)");
        CHECK(client.requests_sent() == 0);
    }
}

TEST_CASE("HttpClient::send verifies TLS", "[annotate]") {
    if (!python_available()) {
        WARN("python3 is not installed; skipping the fake platform tests");
        return;
    }
    TempDir dir;
    if (!make_certificate(dir, "server") || !make_certificate(dir, "other")) {
        WARN("openssl is not installed; skipping the TLS test");
        return;
    }
    FakeForge forge(base_config(), dir.path() + "/server.pem", dir.path() + "/server.key");
    REQUIRE(forge.origin().rfind("https://", 0) == 0);
    HttpSettings s = settings();
    s.attempts = 1;
    SECTION("an untrusted certificate fails and nothing reaches the server") {
        HttpClient client(s);
        CHECK_THROWS_WITH(client.send(user_request(forge.origin())),
                          Catch::Contains("certificate"));
        CHECK(forge.requests().empty());
    }
    SECTION("another CA than the one that signed it fails too") {
        s.ca_file = dir.path() + "/other.pem";
        HttpClient client(s);
        CHECK_THROWS_WITH(client.send(user_request(forge.origin())),
                          Catch::Contains("certificate"));
        CHECK(forge.requests().empty());
    }
    SECTION("the CA given with ca_file is trusted") {
        s.ca_file = dir.path() + "/server.pem";
        HttpClient client(s);
        CHECK(client.send(user_request(forge.origin())).status == 200);
        CHECK(forge.requests("GET", "/user").size() == 1);
    }
}

TEST_CASE("libcurl is included only in gate/annotate", "[annotate]") {
    // DEVELOPERS.md's dependency direction: one folder speaks HTTP.
    namespace fs = std::filesystem;
    std::vector<std::string> users;
    for (const char* root : {"core", "gate"}) {
        for (const auto& entry :
             fs::recursive_directory_iterator(fs::path(TOLLGATE_SOURCE_DIR) / root)) {
            if (entry.is_regular_file() &&
                tollgate::test::read_text(entry.path().string()).find("#include <curl/") !=
                    std::string::npos) {
                users.push_back(fs::relative(entry.path(), TOLLGATE_SOURCE_DIR).string());
            }
        }
    }
    CHECK(users == std::vector<std::string>{"gate/annotate/http_client.cpp"});
}
