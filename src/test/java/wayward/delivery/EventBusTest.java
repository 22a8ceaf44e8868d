package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.time.Instant;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import wayward.event.Event;
import wayward.event.EventKind;

class EventBusTest {
    private static Event event(int i) {
        return new Event("e" + i, "cam", "zone", EventKind.WRONG_WAY, Event.Phase.START, i,
                Instant.EPOCH, 0, 0, 0, Double.NaN);
    }

    @Test
    @Timeout(value = 20, unit = TimeUnit.SECONDS)
    void aBlockedSinkNeitherBlocksPublishNorTheOtherSinks() throws InterruptedException {
        CountDownLatch release = new CountDownLatch(1);
        CountDownLatch fastDone = new CountDownLatch(100);
        List<String> slowSeen = new CopyOnWriteArrayList<>();
        EventBus bus = new EventBus();
        bus.add(new EventSink() {
            @Override
            public String name() {
                return "slow";
            }

            @Override
            public void deliver(Event e) throws InterruptedException {
                release.await();
                slowSeen.add(e.id());
            }
        }, 1000);
        bus.add(new EventSink() {
            @Override
            public String name() {
                return "fast";
            }

            @Override
            public void deliver(Event e) {
                fastDone.countDown();
            }
        }, 1000);
        for (int i = 0; i < 100; i++) {
            bus.publish(event(i)); // returns at once although "slow" is stuck
        }
        fastDone.await(); // the fast sink got everything while the slow one was stuck
        release.countDown();
        bus.close(10_000);
        assertEquals(100, slowSeen.size());
        for (int i = 0; i < 100; i++) {
            assertEquals("e" + i, slowSeen.get(i), "in order");
        }
    }
}
