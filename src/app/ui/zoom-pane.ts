import { ChangeDetectionStrategy, Component, computed, input, model, signal } from '@angular/core';

/** Zoom and pan of a photo: shared between panes to keep two photos in step. */
export interface ZoomState {
  scale: number;
  x: number;
  y: number;
}

export const NO_ZOOM: ZoomState = { scale: 1, x: 0, y: 0 };

/**
 * A photo that zooms with the wheel (or + / −) and pans by dragging, with brightness, contrast and a
 * mirror for night and other-side photos. The zoom state is a model so two panes can share one.
 */
@Component({
  selector: 'mac-zoom-pane',
  template: `
    <div
      class="frame photo-surface"
      (wheel)="zoomBy($event)"
      (pointerdown)="startDrag($event)"
      (pointermove)="drag($event)"
      (pointerup)="endDrag()"
      (pointerleave)="endDrag()"
      (dblclick)="zoom.set(noZoom)"
    >
      <img
        [src]="src()"
        [alt]="alt()"
        [style.transform]="transform()"
        [style.filter]="filter()"
        draggable="false"
      />
      <ng-content />
    </div>
  `,
  styles: `
    :host {
      display: block;
      min-height: 0;
    }
    .frame {
      position: relative;
      overflow: hidden;
      width: 100%;
      height: 100%;
      border-radius: 10px;
      cursor: grab;
      touch-action: none;
      display: flex;
      align-items: center;
      justify-content: center;
    }
    img {
      max-width: 100%;
      max-height: 100%;
      transform-origin: center center;
      user-select: none;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ZoomPane {
  readonly src = input.required<string>();
  readonly alt = input('');
  readonly mirrored = input(false);
  readonly brightness = input(1);
  readonly contrast = input(1);
  readonly zoom = model<ZoomState>(NO_ZOOM);
  protected readonly noZoom = NO_ZOOM;
  private readonly dragFrom = signal<{ x: number; y: number; start: ZoomState } | null>(null);
  protected readonly transform = computed(() => {
    const z = this.zoom();
    return `translate(${z.x}px, ${z.y}px) scale(${z.scale})${this.mirrored() ? ' scaleX(-1)' : ''}`;
  });
  protected readonly filter = computed(
    () => `brightness(${this.brightness()}) contrast(${this.contrast()})`,
  );

  protected zoomBy(event: WheelEvent): void {
    event.preventDefault();
    this.step(event.deltaY < 0 ? 1.15 : 1 / 1.15);
  }

  /** Zooms in (> 1) or out (< 1), keeping the pan. */
  step(factor: number): void {
    this.zoom.update((z) => ({ ...z, scale: Math.min(12, Math.max(1, z.scale * factor)) }));
  }

  protected startDrag(event: PointerEvent): void {
    (event.target as HTMLElement).setPointerCapture?.(event.pointerId);
    this.dragFrom.set({ x: event.clientX, y: event.clientY, start: this.zoom() });
  }

  protected drag(event: PointerEvent): void {
    const from = this.dragFrom();
    if (!from) return;
    this.zoom.set({
      ...from.start,
      x: from.start.x + event.clientX - from.x,
      y: from.start.y + event.clientY - from.y,
    });
  }

  protected endDrag(): void {
    this.dragFrom.set(null);
  }
}
