package wayward.http;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.netty.channel.FileRegion;
import io.netty.channel.embedded.EmbeddedChannel;
import io.netty.handler.codec.DecoderResult;
import io.netty.handler.codec.http.DefaultFullHttpRequest;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.FullHttpResponse;
import io.netty.handler.codec.http.HttpContent;
import io.netty.handler.codec.http.HttpHeaderNames;
import io.netty.handler.codec.http.HttpMethod;
import io.netty.handler.codec.http.HttpResponse;
import io.netty.handler.codec.http.HttpVersion;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.channels.Channels;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The router and the evidence responder on an in-memory channel (Netty's EmbeddedChannel): no service behind it, so
 * only routes that need none are asked. Status codes and headers as RFC 9110 and RFC 6750 give them.
 */
class StatusHandlerTest {
    private static final byte[] TOKEN = "yard-token".getBytes(StandardCharsets.UTF_8);

    @TempDir
    Path root;

    private Path evidence;

    private EmbeddedChannel channel(byte[] token) throws IOException {
        evidence = Files.createDirectories(root.resolve("evidence"));
        return new EmbeddedChannel(new StatusHandler(new StatusHandler.Shared(null, token, "status"), new EvidenceFiles(() -> evidence)));
    }

    private static FullHttpRequest get(String uri) {
        return new DefaultFullHttpRequest(HttpVersion.HTTP_1_1, HttpMethod.GET, uri);
    }

    private static FullHttpResponse answer(EmbeddedChannel ch, FullHttpRequest req) {
        ch.writeInbound(req);
        FullHttpResponse r = ch.readOutbound();
        return r;
    }

    private static String body(FullHttpResponse r) {
        return r.content().toString(StandardCharsets.UTF_8);
    }

    @Test
    void onlyGetAndHeadAreAnsweredAndMalformedRequestsCloseTheConnection() throws IOException {
        EmbeddedChannel ch = channel(null);
        FullHttpResponse r = answer(ch, new DefaultFullHttpRequest(HttpVersion.HTTP_1_1, HttpMethod.POST, "/health"));
        assertEquals(405, r.status().code());
        assertEquals("GET, HEAD", r.headers().get(HttpHeaderNames.ALLOW));
        FullHttpRequest bad = get("/health");
        bad.setDecoderResult(DecoderResult.failure(new IllegalArgumentException("bad header")));
        r = answer(ch, bad);
        assertEquals(400, r.status().code());
        assertEquals("malformed request\n", body(r));
        assertFalse(ch.isOpen(), "closed after a malformed request");
    }

    @Test
    void aTokenIsNeededBeyondHealthAndTheScriptAsHeaderOrQueryParameter() throws IOException {
        EmbeddedChannel ch = channel(TOKEN);
        FullHttpResponse r = answer(ch, get("/api/evidence"));
        assertEquals(401, r.status().code());
        assertEquals("Bearer realm=\"wayward\"", r.headers().get(HttpHeaderNames.WWW_AUTHENTICATE)); // RFC 6750 §3
        r = answer(ch, get("/view.js"));
        assertEquals(200, r.status().code());
        assertTrue(r.headers().get(HttpHeaderNames.CONTENT_TYPE).startsWith("text/javascript"));
        r = answer(ch, get("/openapi.json")); // the description holds no site data
        assertEquals(200, r.status().code());
        assertTrue(r.headers().get(HttpHeaderNames.CONTENT_TYPE).startsWith("application/json"));
        FullHttpRequest withHeader = get("/api/evidence");
        withHeader.headers().set(HttpHeaderNames.AUTHORIZATION, "Bearer yard-token");
        assertEquals(200, answer(ch, withHeader).status().code());
        assertEquals(200, answer(ch, get("/api/evidence?access_token=yard-token")).status().code()); // RFC 6750 §2.3
        assertEquals(401, answer(ch, get("/api/evidence?access_token=yard-tokem")).status().code());
        FullHttpRequest wrong = get("/api/evidence");
        wrong.headers().set(HttpHeaderNames.AUTHORIZATION, "Basic eWFyZC10b2tlbg==");
        assertEquals(401, answer(ch, wrong).status().code());
    }

    @Test
    void anUnknownPageIsNamedInA404AndHeadGetsNoBody() throws IOException {
        EmbeddedChannel ch = channel(null);
        FullHttpResponse r = answer(ch, get("/nothing-here"));
        assertEquals(404, r.status().code());
        assertEquals("no such page: /nothing-here\n", body(r));
        // control characters of a request come back escaped (and reach no log raw)
        assertEquals("no such page: /no\\x1b[2Jsuch\n", body(answer(ch, get("/no\u001b[2Jsuch"))));
        r = answer(ch, new DefaultFullHttpRequest(HttpVersion.HTTP_1_1, HttpMethod.HEAD, "/"));
        assertEquals(200, r.status().code());
        assertEquals(0, r.content().readableBytes());
        assertTrue(Integer.parseInt(r.headers().get(HttpHeaderNames.CONTENT_LENGTH)) > 0, "the length a GET would get");
    }

    @Test
    void evidenceFilesAreServedWholeOrByOneRangeAndNothingOutsideTheirFolder() throws IOException {
        EmbeddedChannel ch = channel(null);
        byte[] data = new byte[1000];
        for (int i = 0; i < data.length; i++) {
            data[i] = (byte) i;
        }
        Files.createDirectories(evidence.resolve("dock"));
        Files.write(evidence.resolve("dock/e1.mp4"), data);
        Files.writeString(evidence.getParent().resolve("secret.json"), "{}");
        Files.writeString(evidence.resolve("notes.txt"), "not evidence");

        FullHttpResponse list = answer(ch, get("/api/evidence"));
        assertTrue(body(list).contains("\"url\":\"/evidence/dock/e1.mp4\",\"bytes\":1000"), body(list));
        assertFalse(body(list).contains("notes.txt"), body(list));

        FullHttpRequest ranged = get("/evidence/dock/e1.mp4");
        ranged.headers().set(HttpHeaderNames.RANGE, "bytes=100-103");
        ch.writeInbound(ranged);
        HttpResponse head = ch.readOutbound();
        assertEquals(206, head.status().code());
        assertEquals("bytes 100-103/1000", head.headers().get(HttpHeaderNames.CONTENT_RANGE));
        assertEquals("video/mp4", head.headers().get(HttpHeaderNames.CONTENT_TYPE));
        FileRegion region = ch.readOutbound();
        ByteArrayOutputStream got = new ByteArrayOutputStream();
        region.transferTo(Channels.newChannel(got), 0);
        region.release();
        assertEquals(4, got.size());
        assertEquals(100, got.toByteArray()[0]);
        HttpContent last = ch.readOutbound();
        last.release();

        FullHttpRequest unsatisfiable = get("/evidence/dock/e1.mp4");
        unsatisfiable.headers().set(HttpHeaderNames.RANGE, "bytes=2000-");
        FullHttpResponse r = answer(ch, unsatisfiable);
        assertEquals(416, r.status().code());
        assertEquals("bytes */1000", r.headers().get(HttpHeaderNames.CONTENT_RANGE));

        for (String outside : new String[] {"/evidence/../secret.json", "/evidence/%2e%2e/secret.json",
                "/evidence/notes.txt", "/evidence/dock/missing.mp4", "/evidence/%2Fetc%2Fpasswd"}) {
            assertEquals(404, answer(ch, get(outside)).status().code(), outside);
        }
        assertEquals(400, answer(ch, get("/evidence/%zz.mp4")).status().code());
    }

    @Test
    void aSymbolicLinkOutOfTheFolderIsNotFollowed() throws IOException {
        EmbeddedChannel ch = channel(null);
        Path outside = evidence.getParent().resolve("elsewhere.mp4");
        Files.write(outside, new byte[] {1, 2, 3});
        Files.createSymbolicLink(evidence.resolve("link.mp4"), outside);
        assertEquals(404, answer(ch, get("/evidence/link.mp4")).status().code());
    }

    @Test
    void aBrokenPercentEscapeIsTheClientsMistakeAndLeavesNoTokenInTheLog() throws IOException {
        EmbeddedChannel ch = channel(TOKEN);
        try (wayward.delivery.LogCapture log = new wayward.delivery.LogCapture(StatusHandler.class)) {
            // RFC 3986 §2.1: "%" must be followed by two hex digits; RFC 9110 §15.5.1: 400 for a malformed request
            FullHttpResponse r = answer(ch, get("/api/events?access_token=yard-token&limit=%zz"));
            assertEquals(400, r.status().code());
            assertEquals(400, answer(ch, get("/evidence/lane%2?access_token=yard-token")).status().code());
            assertEquals(400, answer(ch, get("/api/measure%?access_token=yard-token")).status().code());
            assertTrue(log.lines().stream().noneMatch(l -> l.startsWith("ERROR") || l.contains("yard-token")),
                    String.valueOf(log.lines()));
        }
    }

    @Test
    void theEvidenceListComesInPagesWithItsTotal() throws IOException {
        EmbeddedChannel ch = channel(null);
        for (int i = 0; i < 250; i++) {
            Files.writeString(evidence.resolve(String.format(java.util.Locale.ROOT, "c%03d.json", i)), "{}");
        }
        String first = body(answer(ch, get("/api/evidence")));
        assertTrue(first.startsWith("{\"total\":250,\"offset\":0,\"files\":[{\"path\":\"evidence/c000.json\""), first);
        assertEquals(EvidenceFiles.DEFAULT_PAGE, first.split("\"path\"").length - 1);
        String last = body(answer(ch, get("/api/evidence?offset=240&limit=50")));
        assertEquals(10, last.split("\"path\"").length - 1);
        assertTrue(last.contains("evidence/c249.json") && !last.contains("evidence/c239.json"), last);
        assertEquals(400, answer(ch, get("/api/evidence?limit=0")).status().code());
        assertEquals(400, answer(ch, get("/api/evidence?offset=-1")).status().code());
        assertEquals("{\"total\":250,\"offset\":999,\"files\":[]}", body(answer(ch, get("/api/evidence?offset=999"))).strip());
    }
}
