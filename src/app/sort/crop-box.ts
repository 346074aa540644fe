import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';

/** A rectangle in fractions of the photo. */
export interface CropRect {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Draws a crop box over a photo by dragging; the box is reported in fractions of the photo. */
@Component({
  selector: 'mac-crop-box',
  template: `
    <div
      class="layer"
      [class.active]="enabled()"
      (pointerdown)="start($event)"
      (pointermove)="move($event)"
      (pointerup)="end()"
    >
      @if (shown(); as r) {
        <div
          class="box"
          [style.left.%]="r.x * 100"
          [style.top.%]="r.y * 100"
          [style.width.%]="r.w * 100"
          [style.height.%]="r.h * 100"
        ></div>
      }
    </div>
  `,
  styles: `
    .layer {
      position: absolute;
      inset: 0;
    }
    .layer.active {
      cursor: crosshair;
    }
    .box {
      position: absolute;
      border: 2px solid #eebd8e;
      box-shadow: 0 0 0 9999px rgb(0 0 0 / 35%);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CropBox {
  readonly enabled = input(false);
  readonly value = input<CropRect | null>(null);
  readonly changed = output<CropRect | null>();
  private readonly origin = signal<{ x: number; y: number; el: HTMLElement } | null>(null);
  private readonly live = signal<CropRect | null>(null);
  protected readonly shown = computed(() => this.live() ?? this.value());

  private point(event: PointerEvent, el: HTMLElement): { x: number; y: number } {
    const r = el.getBoundingClientRect();
    return {
      x: Math.min(1, Math.max(0, (event.clientX - r.left) / r.width)),
      y: Math.min(1, Math.max(0, (event.clientY - r.top) / r.height)),
    };
  }

  protected start(event: PointerEvent): void {
    if (!this.enabled()) return;
    const el = event.currentTarget as HTMLElement;
    el.setPointerCapture?.(event.pointerId);
    this.origin.set({ ...this.point(event, el), el });
    this.live.set(null);
  }

  protected move(event: PointerEvent): void {
    const o = this.origin();
    if (!o) return;
    const p = this.point(event, o.el);
    this.live.set({
      x: Math.min(o.x, p.x),
      y: Math.min(o.y, p.y),
      w: Math.abs(p.x - o.x),
      h: Math.abs(p.y - o.y),
    });
  }

  protected end(): void {
    const box = this.live();
    this.origin.set(null);
    this.live.set(null);
    if (box && box.w > 0.02 && box.h > 0.02) this.changed.emit(box);
  }
}
