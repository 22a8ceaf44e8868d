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

    private static final Event EVENT = new Event("7d1c", "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY,
            Event.Phase.START, 12.3, Instant.parse("2026-12-02T10:00:00Z"), 180, 45, 0.04, Double.NaN);

    /** Starts a receiver whose n-th answer (0-based) is statuses[min(n, last)]. */
    private String receiver(int... statuses) throws IOException {
        server = HttpServer.create(new InetSocketAddress("127.0.0.1", 0), 0);
        server.createContext("/hook", exchange -> {
            int n = calls.getAndIncrement();
            bodies.add(new String(exchange.getRequestBody().readAllBytes(), StandardCharsets.UTF_8));
            ids.add(exchange.getRequestHeaders().getFirst(WebhookSender.EVENT_ID_HEADER));
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
