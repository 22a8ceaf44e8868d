package wayward.http;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import io.netty.channel.embedded.EmbeddedChannel;
import io.netty.handler.codec.http.DefaultFullHttpRequest;
import io.netty.handler.codec.http.FullHttpResponse;
import io.netty.handler.codec.http.HttpMethod;
import io.netty.handler.codec.http.HttpVersion;
import java.nio.charset.StandardCharsets;
import java.time.Instant;
import org.junit.jupiter.api.Test;
import wayward.delivery.RecentEvents;
import wayward.event.Event;
import wayward.event.EventKind;

/** The JSON and text views on an in-memory channel, over a running service of our own making (no cameras). */
class ViewsTest {
    private final RecentEvents recent = new RecentEvents(10);

    private final StatusSource site = new EmptySite(recent);

    private FullHttpResponse get(String uri) {
        return get(site, uri);
    }

    private static FullHttpResponse get(StatusSource site, String uri) {
        EmbeddedChannel ch = new EmbeddedChannel(new StatusHandler(new StatusHandler.Shared(site, null, null),
                new EvidenceFiles(site::evidenceDir)));
        ch.writeInbound(new DefaultFullHttpRequest(HttpVersion.HTTP_1_1, HttpMethod.GET, uri));
        return ch.readOutbound();
    }

    private static String body(FullHttpResponse r) {
        return r.content().toString(StandardCharsets.UTF_8).strip();
    }

    @Test
    void healthSaysReadyWithNothingDownOrStopped() {
        FullHttpResponse r = get("/health/ready");
        assertEquals(200, r.status().code());
        assertEquals("{\"alive\":true,\"ready\":true,\"cameras_lost\":[],\"delivery_stopped\":[]}", body(r));
    }

    @Test
    void notReadyWhileTheServiceIsStillStartingItsCameras() {
        // the status server is bound before the cameras start: liveness yes, readiness not yet
        StatusSource starting = new StatusSource() {
            @Override
            public java.util.List<wayward.analysis.CameraStatus> cameraStatus() {
                return site.cameraStatus();
            }

            @Override
            public wayward.delivery.EventBus bus() {
                return site.bus();
            }

            @Override
            public wayward.delivery.Outbox outbox() {
                return site.outbox();
            }

            @Override
            public RecentEvents recentEvents() {
                return site.recentEvents();
            }

            @Override
            public boolean starting() {
                return true;
            }

            @Override
            public java.nio.file.Path evidenceDir() {
                return site.evidenceDir();
            }
        };
        FullHttpResponse ready = get(starting, "/health/ready");
        assertEquals(503, ready.status().code());
        assertEquals("{\"alive\":true,\"ready\":false,\"cameras_lost\":[],\"delivery_stopped\":[]}", body(ready));
        assertEquals(200, get(starting, "/health").status().code());
    }

    @Test
    void eventsAreTheLastPhasesNewestLastAndTheLimitIsChecked() {
        for (int i = 0; i < 3; i++) {
            recent.deliver(new Event("id-" + i, "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY, Event.Phase.START,
                    i, Instant.parse("2026-12-03T08:00:00Z"), 180, 45, 0.04, Double.NaN));
        }
        String two = body(get("/api/events?limit=2"));
        assertTrue(two.startsWith("{\"events\":[{\"schema\":1,\"id\":\"id-1\"") && two.contains("\"id\":\"id-2\"")
                && !two.contains("id-0"), two);
        assertEquals(400, get("/api/events?limit=0").status().code());
        assertEquals(400, get("/api/events?limit=ten").status().code());
    }

    @Test
    void metricsAreThePrometheusTextFormat() {
        FullHttpResponse r = get("/metrics");
        assertEquals(200, r.status().code());
        // Prometheus exposition format 0.0.4: HELP and TYPE lines before each family's samples
        assertTrue(r.headers().get("Content-Type").startsWith("text/plain; version=0.0.4"));
        String text = body(r);
        assertTrue(text.contains("# TYPE wayward_outbox_bytes gauge\nwayward_outbox_bytes 0"), text);
        assertTrue(text.contains("# TYPE wayward_process_uptime_seconds gauge"), text);
    }
}
