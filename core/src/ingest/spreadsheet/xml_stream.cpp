#include "ingest/spreadsheet/xml_stream.h"

#include <expat.h>

namespace siftwave::ingest::detail {
namespace {

struct ParseState {
    XML_Parser parser;
    XmlHandler* handler;
    bool doctype = false;
};

void onStart(void* data, const XML_Char* name, const XML_Char** attributes) {
    auto* state = static_cast<ParseState*>(data);
    state->handler->start(localName(name), attributes);
    if (state->handler->stop || !state->handler->failure.empty())
        XML_StopParser(state->parser, XML_FALSE);
}

void onEnd(void* data, const XML_Char* name) {
    auto* state = static_cast<ParseState*>(data);
    state->handler->end(localName(name));
    if (state->handler->stop || !state->handler->failure.empty())
        XML_StopParser(state->parser, XML_FALSE);
}

void onText(void* data, const XML_Char* text, int length) {
    auto* state = static_cast<ParseState*>(data);
    if (state->handler->collecting)
        state->handler->text(std::string_view(text, static_cast<std::size_t>(length)));
}

void onDoctype(void* data, const XML_Char*, const XML_Char*, const XML_Char*, int) {
    auto* state = static_cast<ParseState*>(data);
    state->doctype = true;
    XML_StopParser(state->parser, XML_FALSE);
}

}  // namespace

Status parseXmlPart(ZipArchive& archive, std::string_view name, XmlHandler& handler) {
    XML_Parser parser = XML_ParserCreate("UTF-8");
    if (!parser)
        return archive.fail("out of memory while reading the workbook");
    ParseState state{parser, &handler};
    XML_SetUserData(parser, &state);
    XML_SetElementHandler(parser, onStart, onEnd);
    XML_SetCharacterDataHandler(parser, onText);
    XML_SetStartDoctypeDeclHandler(parser, onDoctype);
    const std::string part(name);
    std::string xmlError;
    auto describe = [&] {
        return "malformed XML in the workbook part " + part + " at line " +
               std::to_string(XML_GetCurrentLineNumber(parser)) + ", column " +
               std::to_string(XML_GetCurrentColumnNumber(parser)) + ": " +
               XML_ErrorString(XML_GetErrorCode(parser));
    };
    bool halted = false;
    Status streamed = archive.stream(name, [&](std::string_view piece) {
        if (XML_Parse(parser, piece.data(), static_cast<int>(piece.size()), XML_FALSE) ==
            XML_STATUS_OK)
            return true;
        if (XML_GetErrorCode(parser) == XML_ERROR_ABORTED)
            halted = true;
        else
            xmlError = describe();
        return false;
    });
    if (streamed && !halted && xmlError.empty() &&
        XML_Parse(parser, nullptr, 0, XML_TRUE) != XML_STATUS_OK) {
        if (XML_GetErrorCode(parser) == XML_ERROR_ABORTED)
            halted = true;
        else
            xmlError = describe();
    }
    XML_ParserFree(parser);
    if (!streamed)
        return streamed;
    if (state.doctype)
        return archive.fail("the workbook part " + part +
                            " declares a DTD, which no workbook does; it is refused (entity "
                            "expansion)");
    if (!handler.failure.empty())
        return archive.fail(handler.failure);
    if (!xmlError.empty())
        return archive.fail(xmlError);
    return Ok{};
}

}  // namespace siftwave::ingest::detail
