"""Keys handled one at a time, to the end, in the order they were typed.

Why: Textual hands a key to the focused widget's message queue; an unhandled key
then hops queue by queue up to the app, where the bindings are looked up, and a
binding's action often opens an editor through yet another message (a table's
"selected") and moves focus later still (``Widget.focus`` is deferred). Keys typed
in the meantime reached the old focus and were lost or misread ("Welder" became
"lder", Ctrl+U ran after the digits typed behind it).

Here the app runs a key's whole journey -- priority bindings, the focused widget
and its ancestors, the other bindings -- before it takes the next key; the
messages that open an editor are delivered at once (:func:`deliver_now`) and focus
moves at once (:func:`focus_now`). This leans on Textual internals
(``_check_bindings``, ``_get_dispatch_methods``); Textual is pinned exactly.
"""

from __future__ import annotations

import inspect

from textual import events
from textual._callback import invoke
from textual._dispatch_key import dispatch_key
from textual.app import App
from textual.message import Message
from textual.message_pump import MessagePump
from textual.widget import Widget


def focus_now(widget: Widget, scroll_visible: bool = True) -> None:
    """Move focus to ``widget`` now (``Widget.focus`` waits for the next idle moment)."""
    try:
        widget.screen.set_focus(widget, scroll_visible=scroll_visible)
    except Exception:
        widget.focus(scroll_visible)


def deliver_now(sender: MessagePump, message: Message, *, to_app: bool = False) -> None:
    """Run ``message``'s handlers on ``sender`` and up its ancestors now, as bubbling would
    (the app too with ``to_app``; :func:`offgrid.tui.messages.send` is that case).

    Synchronous handlers run at once; a coroutine handler is scheduled in order. Delivery
    stops where a handler calls ``message.stop()``.
    """
    message._sender = sender
    node: MessagePump | None = sender
    while node is not None and (to_app or not isinstance(node, App)):
        for _cls, method in node._get_dispatch_methods(message.handler_name, message):
            result = method(message)
            if inspect.isawaitable(result):
                node.call_next(lambda r=result: r)
        if message._stop_propagation or not message.bubble:
            return
        node = node._parent


async def handle_key_now(app: App, event: events.Key) -> None:
    """The whole handling of one key, in the app's own task, before the next key."""
    if not app.app_focus:
        app.app_focus = True
    if app.focused is not None:
        app.screen._clear_tooltip()
    if await app._check_bindings(event.key, priority=True):
        return
    event._set_forwarded()
    node = app.focused or app.screen
    while node is not None and not isinstance(node, App):
        for _cls, method in node._get_dispatch_methods(event.handler_name, event):
            await invoke(method, event)
        if event._stop_propagation:
            return
        node = node.parent  # type: ignore[assignment]
    if not await app._check_bindings(event.key):
        await dispatch_key(app, event)
