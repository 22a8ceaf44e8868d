package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.sun.net.httpserver.HttpServer;
import java.io.IOException;
import java.net.InetSocketAddress;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import wayward.config.WebhookConfig;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;

/**
 * Delivery to a real HTTP server on loopback: the JDK's own com.sun.net.httpserver, an HTTP/1.1
 * implementation independent of Netty.
 */
@Timeout(value = 30, unit = TimeUnit.SECONDS)
class WebhookSenderTest {
    private HttpServer server;
    private final List<String> bodies = new CopyOnWriteArrayList<>();
    private final List<String> ids = new CopyOnWriteArrayList<>();
    private final AtomicInteger calls = new AtomicInteger();
    private final List<String> signatures = new CopyOnWriteArrayList<>();
    private final List<String> timestamps = new CopyOnWriteArrayList<>();

    private static final Event EVENT = new Event("7d1c", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY,
            Event.Phase.START, 12.3, Instant.parse("2026-12-02T10:00:00Z"), 180, 45, 0.04, Double.NaN);

    /** Starts a receiver whose n-th answer (0-based) is statuses[min(n, last)]. */
    private String receiver(int... statuses) throws IOException {
        server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.createContext("/hook", exchange -> {
            int n = calls.getAndIncrement();
            bodies.add(new String(exchange.getRequestBody().readAllBytes(), StandardCharsets.UTF_8));
            ids.add(exchange.getRequestHeaders().getFirst(WebhookSender.EVENT_ID_HEADER));
            String sig = exchange.getRequestHeaders().getFirst(WebhookSignature.SIGNATURE_HEADER);
            String ts = exchange.getRequestHeaders().getFirst(WebhookSignature.TIMESTAMP_HEADER);
            signatures.add(sig == null ? "" : sig);
            timestamps.add(ts == null ? "" : ts);
            int status = statuses[Math.min(n, statuses.length - 1)];
            byte[] answer = "ok".getBytes(StandardCharsets.UTF_8);
            exchange.sendResponseHeaders(status, answer.length);
            exchange.getResponseBody().write(answer);
            exchange.close();
        });
        server.start();
        return "http://127.0.0.1:" + server.getAddress().getPort() + "/hook";
    }

    @AfterEach
    void stop() {
        if (server != null) {
            server.stop(0);
        }
    }

    @Test
    void retriesAfter500AndStopsAt200() throws Exception {
        String url = receiver(500, 200);
        try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5, 3), 10)) {
            s.deliver(EVENT);
        }
        assertEquals(2, calls.get());
        assertEquals(EventJson.toJson(EVENT), bodies.get(1));
        assertEquals("7d1c", ids.get(1));
    }

    @Test
    void signedPostsVerifyWithTheSharedSecret() throws Exception {
        String url = receiver(200);
        byte[] secret = "yard-hook-secret".getBytes(StandardCharsets.UTF_8);
        try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5, 0, "hook.secret", secret), 10)) {
            s.deliver(EVENT);
        }
        // the receiver's check, written as the README describes it, with the JDK's javax.crypto directly
        javax.crypto.Mac mac = javax.crypto.Mac.getInstance("HmacSHA256");
        mac.init(new javax.crypto.spec.SecretKeySpec(secret, "HmacSHA256"));
        byte[] expected = mac.doFinal((timestamps.get(0) + "." + bodies.get(0)).getBytes(StandardCharsets.UTF_8));
        StringBuilder hex = new StringBuilder("sha256=");
        for (byte b : expected) {
            hex.append(String.format("%02x", b));
        }
        assertEquals(hex.toString(), signatures.get(0));
        long age = System.currentTimeMillis() / 1000 - Long.parseLong(timestamps.get(0));
        org.junit.jupiter.api.Assertions.assertTrue(age >= 0 && age < 60, "timestamp age " + age + " s");
    }

    @Test
    void unsignedWithoutASecret() throws Exception {
        String url = receiver(200);
        try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5, 0), 10)) {
            s.deliver(EVENT);
        }
        assertEquals("", signatures.get(0));
    }

    @Test
    void doesNotRetryAClientError() throws Exception {
        String url = receiver(404);
        try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5, 3), 10)) {
            s.deliver(EVENT);
        }
        assertEquals(1, calls.get());
    }

    @Test
    void retries429AndGivesUpAfterTheConfiguredRetries() throws Exception {
        String url = receiver(429);
        try (WebhookSender s = new WebhookSender(new WebhookConfig(url, 5, 2), 10)) {
            s.deliver(EVENT);
        }
        assertEquals(3, calls.get(), "first attempt plus 2 retries");
    }

    @Test
    void unreachableReceiverIsRetriedThenGivenUp() throws Exception {
        // a port that was just free: nothing listens there, so connecting is refused
        HttpServer probe = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        int port = probe.getAddress().getPort();
        probe.stop(0);
        try (WebhookSender s = new WebhookSender(new WebhookConfig("http://127.0.0.1:" + port + "/hook", 2, 1), 10)) {
            s.deliver(EVENT); // returns after logging; must not throw
        }
    }
}
