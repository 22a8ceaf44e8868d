package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.event.Event;
import wayward.event.EventKind;

/** The courier's guarantees with a destination whose answers the test controls. */
@Timeout(value = 30, unit = TimeUnit.SECONDS)
class CourierTest {
    @TempDir
    Path dir;

    private static Event event(int i) {
        return new Event("e" + i, "cam", "zone-" + (i % 3), EventKind.WRONG_WAY,
                i % 2 == 0 ? Event.Phase.START : Event.Phase.END, i, Instant.EPOCH, 0, 0, 0, Double.NaN);
    }

    /** Answers only when the test completes the futures; remembers what was sent. */
    private static final class HeldDestination implements Destination {
        final ConcurrentLinkedQueue<CompletableFuture<Result>> open = new ConcurrentLinkedQueue<>();
        final List<String> sent = new CopyOnWriteArrayList<>();
        final int window;

        HeldDestination(int window) {
            this.window = window;
        }

        @Override
        public String name() {
            return "held";
        }

        @Override
        public String key() {
            return "held";
        }

        @Override
        public int window() {
            return window;
        }

        @Override
        public CompletableFuture<Result> send(long seq, Event e) {
            sent.add(e.id());
            CompletableFuture<Result> f = new CompletableFuture<>();
            open.add(f);
            return f;
        }
    }

    @Test
    void aWindowOfPublishesAdvancesProgressOnlyPastAnsweredOnesAndTheRestComeAgainAfterARestart() throws Exception {
        HeldDestination d = new HeldDestination(4);
        EventBus bus = new EventBus();
        Outbox outbox = Outbox.open(dir, 1 << 20, 1 << 16);
        bus.useOutbox(outbox);
        Courier c = bus.add(d, 10, 20);
        for (int i = 1; i <= 10; i++) {
            bus.publish(event(i));
        }
        while (d.sent.size() < 4) {
            Thread.sleep(5);
        }
        Thread.sleep(100);
        assertEquals(List.of("e1", "e2", "e3", "e4"), d.sent, "no more than the window outstanding");
        List<CompletableFuture<Destination.Result>> first = new ArrayList<>(d.open);
        first.get(1).complete(Destination.Result.DELIVERED); // out of order: e2 before e1
        first.get(0).complete(Destination.Result.DELIVERED);
        while (c.next() < 3) {
            Thread.sleep(5);
        }
        // e3 and e4 stay unanswered: the service stops ("crashes" for this destination)
        bus.close(300);
        assertEquals(3, c.next(), "progress stops before the first unanswered phase");

        HeldDestination again = new HeldDestination(4);
        EventBus bus2 = new EventBus();
        bus2.useOutbox(Outbox.open(dir, 1 << 20, 1 << 16));
        Courier c2 = bus2.add(again, 10, 20);
        // everything from e3 on comes again, in order, and is answered
        int answered = 0;
        while (answered < 8) {
            CompletableFuture<Destination.Result> f = again.open.poll();
            if (f == null) {
                Thread.sleep(5);
                continue;
            }
            f.complete(Destination.Result.DELIVERED);
            answered++;
        }
        bus2.close(5000);
        assertEquals(List.of("e3", "e4", "e5", "e6", "e7", "e8", "e9", "e10"), again.sent);
        assertEquals(11, c2.next());
    }

    @Test
    void aFailedAttemptIsRepeatedUntilDeliveredAndOrderIsKept() throws Exception {
        List<String> log = new CopyOnWriteArrayList<>();
        int[] failuresLeft = {3};
        Destination flaky = new Destination() {
            @Override
            public String name() {
                return "flaky";
            }

            @Override
            public String key() {
                return "flaky";
            }

            @Override
            public CompletableFuture<Result> send(long seq, Event e) {
                if (e.id().equals("e2") && failuresLeft[0]-- > 0) {
                    log.add("fail " + e.id());
                    return CompletableFuture.completedFuture(Result.retry("HTTP 503"));
                }
                log.add("ok " + e.id());
                return CompletableFuture.completedFuture(Result.DELIVERED);
            }
        };
        EventBus bus = new EventBus();
        bus.useOutbox(Outbox.open(dir, 1 << 20, 1 << 16));
        Courier c = bus.add(flaky, 5, 20);
        for (int i = 1; i <= 3; i++) {
            bus.publish(event(i));
        }
        bus.close(10_000);
        assertEquals(List.of("ok e1", "fail e2", "fail e2", "fail e2", "ok e2", "ok e3"), log);
        assertEquals(3, c.delivered());
        assertEquals(3, c.retries());
    }
}
