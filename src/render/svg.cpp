#include "render/svg.hpp"

#include <fmt/format.h>

#include <cmath>

namespace overshoot::render::svg {

std::string escape(std::string_view text) {
    std::string out;
    out.reserve(text.size());
    for (char c : text) {
        switch (c) {
            case '&': out += "&amp;"; break;
            case '<': out += "&lt;"; break;
            case '>': out += "&gt;"; break;
            case '"': out += "&quot;"; break;
            case '\'': out += "&#39;"; break;
            default:
                // Control characters other than tab and newline are not allowed in XML 1.0.
                if (static_cast<unsigned char>(c) < 0x20 && c != '\t' && c != '\n') out += ' ';
                else out += c;
        }
    }
    return out;
}

std::string num(double x) {
    if (!std::isfinite(x)) return "0";
    std::string s = fmt::format("{:.2f}", x);
    while (!s.empty() && s.back() == '0') s.pop_back();
    if (!s.empty() && s.back() == '.') s.pop_back();
    if (s == "-0" || s.empty()) s = "0";
    return s;
}

Element& Element::set(std::string name, std::string value) {
    for (auto& a : attrs)
        if (a.first == name) {
            a.second = std::move(value);
            return *this;
        }
    attrs.emplace_back(std::move(name), std::move(value));
    return *this;
}

Element& Element::set(std::string name, double value) { return set(std::move(name), num(value)); }

Element& Element::content(std::string t) {
    text = std::move(t);
    return *this;
}

Element& Element::add(Element child) {
    children.push_back(std::move(child));
    return *this;
}

void Element::write(std::string& out, int depth) const {
    out.append(static_cast<std::size_t>(depth) * 2, ' ');
    out += '<';
    out += tag;
    for (const auto& [k, v] : attrs) {
        out += ' ';
        out += k;
        out += "=\"";
        out += escape(v);
        out += '"';
    }
    if (text.empty() && children.empty()) {
        out += "/>\n";
        return;
    }
    out += '>';
    out += escape(text);
    if (!children.empty()) {
        out += '\n';
        for (const auto& c : children) c.write(out, depth + 1);
        out.append(static_cast<std::size_t>(depth) * 2, ' ');
    }
    out += "</";
    out += tag;
    out += ">\n";
}

std::string Element::str() const {
    std::string out;
    write(out);
    return out;
}

Element line(double x1, double y1, double x2, double y2, std::string_view stroke, double width) {
    Element e("line");
    e.set("x1", x1).set("y1", y1).set("x2", x2).set("y2", y2).set("stroke", std::string(stroke)).set("stroke-width", width);
    return e;
}

Element rect(double x, double y, double w, double h, std::string_view fill) {
    Element e("rect");
    e.set("x", x).set("y", y).set("width", w).set("height", h).set("fill", std::string(fill));
    return e;
}

Element circle(double cx, double cy, double r, std::string_view fill) {
    Element e("circle");
    e.set("cx", cx).set("cy", cy).set("r", r).set("fill", std::string(fill));
    return e;
}

Element text(double x, double y, std::string content, double size, std::string_view anchor) {
    Element e("text");
    e.set("x", x).set("y", y).set("font-size", size);
    if (anchor != "start") e.set("text-anchor", std::string(anchor));
    e.content(std::move(content));
    return e;
}

static std::string points_of(const std::vector<std::pair<double, double>>& points) {
    std::string s;
    for (const auto& [x, y] : points) {
        if (!s.empty()) s += ' ';
        s += num(x);
        s += ',';
        s += num(y);
    }
    return s;
}

Element polyline(const std::vector<std::pair<double, double>>& points, std::string_view stroke, double width) {
    Element e("polyline");
    e.set("points", points_of(points)).set("fill", "none").set("stroke", std::string(stroke)).set("stroke-width", width);
    e.set("stroke-linejoin", "round");
    return e;
}

Element polygon(const std::vector<std::pair<double, double>>& points, std::string_view fill) {
    Element e("polygon");
    e.set("points", points_of(points)).set("fill", std::string(fill));
    return e;
}

Element document(double width, double height, std::string title, std::string description) {
    Element root("svg");
    root.set("xmlns", "http://www.w3.org/2000/svg")
        .set("viewBox", fmt::format("0 0 {} {}", num(width), num(height)))
        .set("width", width)
        .set("height", height)
        .set("role", "img")
        .set("font-family", "'DejaVu Sans', 'Liberation Sans', Arial, sans-serif");
    root.add(Element("title").content(std::move(title)));
    root.add(Element("desc").content(std::move(description)));
    return root;
}

std::string file(const Element& root) { return "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n" + root.str(); }

}  // namespace overshoot::render::svg
