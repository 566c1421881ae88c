import { applyDecorators, Body, Controller, Get, HttpCode, Param, Post, Query } from '@nestjs/common';
import type { CommentDto, ReviewDeskItemDto, ReviewTransitionDto, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { CommentBody, OptionalNoteBody, ApproveBody, RequestChangesBody, ReviewDeskQuery } from './reviews.dto';
import { ReviewsService } from './reviews.service';
import { REVIEW_TRANSITIONS as T } from '@psiform/server';

/** A review step's route: POST answering 200 (the figure changes state, nothing is created), for the roles of its row in the transition table. */
function Step(path: string, transition: keyof typeof T): MethodDecorator {
  return applyDecorators(Post(path), HttpCode(200), Roles(...T[transition].roles));
}

/** Review steps on a figure; roles from the transition table, membership and state in ReviewsService. */
@Controller('figures')
export class ReviewsController {
  constructor(private readonly reviews: ReviewsService) {}

  @Step(':id/submit', 'submit')
  submit(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<ReviewTransitionDto> {
    return this.reviews.submit(user, id);
  }

  @Step(':id/request-changes', 'request_changes')
  requestChanges(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: RequestChangesBody): Promise<ReviewTransitionDto> {
    return this.reviews.requestChanges(user, id, body.note);
  }

  @Step(':id/approve', 'approve')
  approve(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: ApproveBody): Promise<ReviewTransitionDto> {
    return this.reviews.approve(user, id, body.note || undefined, body.override);
  }

  @Step(':id/colour-signoff', 'colour_signoff')
  colourSignoff(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: OptionalNoteBody): Promise<ReviewTransitionDto> {
    return this.reviews.colourSignoff(user, id, body.note || undefined);
  }

  @Step(':id/release', 'release')
  release(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<ReviewTransitionDto> {
    return this.reviews.release(user, id);
  }

  @Post(':id/comments')
  addComment(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: CommentBody): Promise<CommentDto> {
    return this.reviews.addComment(user, id, body);
  }

  @Get(':id/comments')
  listComments(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<CommentDto[]> {
    return this.reviews.listComments(user, id);
  }
}

@Controller('review-desk')
export class ReviewDeskController {
  constructor(private readonly reviews: ReviewsService) {}

  /** Proofs in the caller's publications (in review unless ?state= says otherwise), oldest first; filtered by publication and age. */
  @Get()
  @Roles('editor', 'art_director', 'admin')
  list(@CurrentUser() user: UserDto, @Query() query: ReviewDeskQuery): Promise<ReviewDeskItemDto[]> {
    return this.reviews.reviewDesk(user, query);
  }
}
