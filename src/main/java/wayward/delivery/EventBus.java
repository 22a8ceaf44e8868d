package wayward.delivery;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.event.Event;

/**
 * Fans event phases out to sinks. Each sink has its own bounded queue and thread, so a slow or failing
 * destination never delays analysis or the other sinks. {@link #publish} never blocks: when a sink's queue is
 * full the event is dropped for that sink, counted and logged (a later issue puts a durable outbox here).
 */
public final class EventBus implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(EventBus.class);

    private final List<Lane> lanes = new ArrayList<>();

    private static final class Lane {
        final EventSink sink;
        final BlockingQueue<Event> queue;
        final AtomicLong dropped = new AtomicLong();
        final AtomicLong delivered = new AtomicLong();
        final Thread thread;
        volatile boolean closing;

        Lane(EventSink sink, int capacity) {
            this.sink = sink;
            this.queue = new ArrayBlockingQueue<>(capacity);
            this.thread = new Thread(this::loop, "deliver-" + sink.name().replaceAll("[^A-Za-z0-9.-]+", "-"));
            this.thread.setDaemon(true);
        }

        void loop() {
            try {
                while (true) {
                    Event e = queue.poll(200, TimeUnit.MILLISECONDS);
                    if (e == null) {
                        if (closing && queue.isEmpty()) {
                            return;
                        }
                        continue;
                    }
                    try {
                        sink.deliver(e);
                        delivered.incrementAndGet();
                    } catch (InterruptedException ie) {
                        throw ie;
                    } catch (RuntimeException ex) {
                        LOG.error("{}: delivery of event {} failed: {}", sink.name(), e.id(), ex.toString());
                    }
                }
            } catch (InterruptedException ie) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /** Adds a sink with a queue of {@code capacity} events and starts its thread. Before any publish. */
    public synchronized void add(EventSink sink, int capacity) {
        Lane lane = new Lane(sink, capacity);
        lanes.add(lane);
        lane.thread.start();
    }

    /** Queues an event phase for every sink. Never blocks; any thread. */
    public void publish(Event e) {
        for (Lane lane : lanes) {
            if (!lane.queue.offer(e)) {
                long n = lane.dropped.incrementAndGet();
                LOG.error("{}: queue full, event {} {} {} dropped ({} dropped so far)", lane.sink.name(),
                        e.id(), e.kind().jsonName(), e.phase().jsonName(), n);
            }
        }
    }

    /** Events delivered to all sinks together, for status and tests. */
    public long delivered() {
        long n = 0;
        for (Lane lane : lanes) {
            n += lane.delivered.get();
        }
        return n;
    }

    /**
     * Lets every sink finish its queue, waiting at most {@code timeoutMillis} overall, then closes the sinks.
     * What is still queued after that is reported in the log.
     */
    public void close(long timeoutMillis) {
        long deadline = System.nanoTime() + timeoutMillis * 1_000_000L;
        for (Lane lane : lanes) {
            lane.closing = true;
        }
        for (Lane lane : lanes) {
            try {
                long left = Math.max(1, (deadline - System.nanoTime()) / 1_000_000L);
                lane.thread.join(left);
            } catch (InterruptedException ie) {
                Thread.currentThread().interrupt();
                break;
            }
            if (lane.thread.isAlive()) {
                lane.thread.interrupt();
                LOG.warn("{}: {} event phases not delivered at shutdown", lane.sink.name(), lane.queue.size());
            }
            lane.sink.close();
        }
    }

    @Override
    public void close() {
        close(10_000);
    }
}
