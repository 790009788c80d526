#pragma once
// Certificates as JSON (the format of docs/certificate.md), Markdown and
// LaTeX, and check reports as text or JSON.
#include <nlohmann/json.hpp>
#include <string>

#include "certify/certificate.hpp"

namespace overshoot::render {

nlohmann::json certificate_json(const Certificate& c);
std::string certificate_markdown(const Certificate& c);
std::string certificate_latex(const Certificate& c);

// The one line certify says on success when the certificate went to a file.
// `json`: the file is the checkable JSON form (the line then says how to re-check it).
std::string certificate_written(const Certificate& c, const std::string& path, bool json);

std::string check_text(const Certificate& c, const CheckReport& r);
nlohmann::json check_json(const Certificate& c, const CheckReport& r);

}  // namespace overshoot::render
