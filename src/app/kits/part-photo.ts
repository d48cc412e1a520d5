import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MAX_PHOTO_BYTES, PHOTO_TYPES, type Part } from '../../../shared/schemas/kits';
import { AppError, UNKNOWN_MESSAGE } from '../errors/app-error';
import { confirmDelete } from './delete-dialog';
import { KitsApi } from './kits-api';

/** Said when a photo is over the limit (before sending, or the server's 413). */
export const PHOTO_TOO_LARGE_MESSAGE =
  'That photo is larger than 5 MB. Save it smaller (or as JPEG) and upload it again.';
/** Said when the file is not a PNG, JPEG or WebP picture (the server's 415). */
export const PHOTO_WRONG_TYPE_MESSAGE =
  'That file is not a PNG, JPEG or WebP picture, whatever its name says. ' +
  'Choose a photo saved in one of those formats.';

/** A part's photo in the parts table: the thumbnail, and upload and remove for editors. */
@Component({
  selector: 'app-part-photo',
  imports: [MatButtonModule, MatIconModule, MatProgressBarModule],
  template: `
    <div class="photo">
      @if (part().hasPhoto) {
        <img [src]="src()" [alt]="part().name" width="48" height="48" loading="lazy" />
      }
      @if (canEdit()) {
        <input
          #picker
          class="visually-hidden"
          type="file"
          accept="image/png,image/jpeg,image/webp"
          tabindex="-1"
          aria-hidden="true"
          (change)="pick($any($event.target).files); picker.value = ''"
        />
        <button
          matIconButton
          type="button"
          [disabled]="busy()"
          [attr.aria-label]="'Upload a photo of ' + part().name"
          (click)="picker.click()"
        >
          <mat-icon aria-hidden="true">add_a_photo</mat-icon>
        </button>
        @if (part().hasPhoto) {
          <button
            matIconButton
            type="button"
            [disabled]="busy()"
            [attr.aria-label]="'Remove the photo of ' + part().name"
            (click)="remove()"
          >
            <mat-icon aria-hidden="true">hide_image</mat-icon>
          </button>
        }
      }
    </div>
    @if (uploading()) {
      <mat-progress-bar
        [mode]="percent() === null ? 'indeterminate' : 'determinate'"
        [value]="percent() ?? 0"
        [attr.aria-label]="'Uploading the photo of ' + part().name"
      />
    }
    @if (error(); as message) {
      <p class="photo-error" role="alert">{{ message }}</p>
    }
  `,
  styles: `
    .photo {
      display: flex;
      align-items: center;
      gap: 0.25rem;
    }
    img {
      object-fit: cover;
      border-radius: 4px;
      border: 1px solid var(--mat-sys-outline-variant);
    }
    mat-progress-bar {
      width: 6rem;
    }
    .photo-error {
      max-width: 14rem;
      margin: 0.25rem 0 0;
      padding: 0.25rem 0.5rem;
      color: var(--mat-sys-on-error-container);
      background: var(--mat-sys-error-container);
      border-radius: 4px;
      white-space: normal;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PartPhoto {
  readonly kitTypeId = input.required<string>();
  readonly part = input.required<Part>();
  readonly canEdit = input(false);
  /** The part as saved after an upload (`hasPhoto` true) or a removal (`hasPhoto` false). */
  readonly changed = output<Part>();

  private readonly api = inject(KitsApi);
  private readonly dialog = inject(MatDialog);

  /** Bumped after each upload so the browser fetches the new picture, not its cached one. */
  private readonly revision = signal(0);
  protected readonly uploading = signal(false);
  protected readonly busy = computed(() => this.uploading());
  /** Upload progress in percent; null while the browser does not know the total. */
  protected readonly percent = signal<number | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly src = computed(() => {
    const url = this.api.photoUrl(this.kitTypeId(), this.part().code);
    return this.revision() ? `${url}?v=${this.revision()}` : url;
  });

  /** Checks the chosen file (size, and the type the browser reports), then uploads it. */
  pick(files: FileList | File[] | null): void {
    const file = files?.[0];
    this.error.set(null);
    if (!file) return;
    if (file.size > MAX_PHOTO_BYTES) {
      this.error.set(PHOTO_TOO_LARGE_MESSAGE);
      return;
    }
    // The server sniffs the bytes anyway; this only saves sending an obviously wrong file.
    if (file.type && !(PHOTO_TYPES as readonly string[]).includes(file.type)) {
      this.error.set(PHOTO_WRONG_TYPE_MESSAGE);
      return;
    }
    this.uploading.set(true);
    this.percent.set(null);
    this.api.uploadPhoto(this.kitTypeId(), this.part().code, file).subscribe({
      next: (event) => {
        if (event.kind === 'progress') {
          this.percent.set(event.percent);
          return;
        }
        this.uploading.set(false);
        this.revision.update((n) => n + 1);
        this.changed.emit(event.part);
      },
      error: (error: unknown) => {
        this.uploading.set(false);
        this.error.set(uploadErrorMessage(error));
      },
    });
  }

  protected remove(): void {
    const part = this.part();
    this.error.set(null);
    confirmDelete(this.dialog, {
      title: 'Remove the photo?',
      message: `The photo of ${part.name} (${part.code}) will be removed. The part stays on the list.`,
      confirm: 'Remove photo',
      run: () => this.api.deletePhoto(this.kitTypeId(), part.code),
    }).subscribe((gone) => {
      if (gone) this.changed.emit({ ...part, hasPhoto: false });
    });
  }
}

/** A failed upload in plain words: too large (413), not a picture (415), or the server's reason. */
export function uploadErrorMessage(error: unknown): string {
  if (!(error instanceof AppError)) return UNKNOWN_MESSAGE;
  if (error.status === 413) return PHOTO_TOO_LARGE_MESSAGE;
  if (error.status === 415) return PHOTO_WRONG_TYPE_MESSAGE;
  return error.message;
}
