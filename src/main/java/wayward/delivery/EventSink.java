package wayward.delivery;

import wayward.event.Event;

/** A destination of event phases. Called by its own delivery thread only; it may block and retry. */
public interface EventSink extends AutoCloseable {
    /** A short name for logs, e.g. "event log" or "webhook https://host/path". */
    String name();

    /** Delivers one event phase; returns normally when done or given up (and logged). */
    void deliver(Event event) throws InterruptedException;

    @Override
    default void close() {
    }
}
